// Small conveniences on top of plain forms and htmx; every page works without this file.
document.addEventListener('DOMContentLoaded', () => {
  // "Tick all" for the language review list.
  for (const table of document.querySelectorAll('table.answers')) {
    const head = table.querySelector('thead th');
    const boxes = table.querySelectorAll('tbody input[type="checkbox"]');
    if (!head || boxes.length === 0) continue;
    const all = document.createElement('input');
    all.type = 'checkbox';
    all.setAttribute('aria-label', 'Tick every answer on this page');
    all.addEventListener('change', () => boxes.forEach((b) => (b.checked = all.checked)));
    head.textContent = '';
    head.appendChild(all);
  }
});
