// Paging through the results of a search whose words travel in a POST body, so they never
// appear in an address, the browser's history or a proxy's log (OWASP ASVS 4.0.3 V8.3.1):
// "Previous" and "Next" are small forms that post the same fields with another offset.
import { count } from './components.js';
import { CsrfField } from './layout.js';

export function PostPager(props: { action: string; fields: Record<string, string>; csrf: string; offset: number; limit: number; total: number }) {
  const end = Math.min(props.total, props.offset + props.limit);
  const step = (offset: number, label: string) => (
    <form method="post" action={props.action} class="inline">
      <CsrfField csrf={props.csrf} />
      {Object.entries(props.fields).map(([name, value]) => <input type="hidden" name={name} value={value} />)}
      <input type="hidden" name="offset" value={String(offset)} />
      <button type="submit" class="link">{label}</button>
    </form>
  );
  return (
    <nav class="pager" aria-label="Pages">
      <span>{props.total === 0 ? 'Nothing to show' : `${count(props.offset + 1)}–${count(end)} of ${count(props.total)}`}</span>
      {props.offset > 0 && step(Math.max(0, props.offset - props.limit), 'Previous')}
      {end < props.total && step(props.offset + props.limit, 'Next')}
    </nav>
  );
}
