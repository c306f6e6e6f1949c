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
  // "Show password" on the sign-in form: lets people check what they typed (OWASP ASVS 4.0.3 V2.1.12).
  for (const toggle of document.querySelectorAll('[data-show-password]')) {
    const box = toggle.querySelector('input[type="checkbox"]');
    const field = box && document.getElementById(box.getAttribute('aria-controls') ?? '');
    if (!field) continue;
    toggle.hidden = false;
    box.addEventListener('change', () => {
      field.type = box.checked ? 'text' : 'password';
    });
  }
});
