// Small shared pieces of the pages.
import type { Child } from 'hono/jsx';

/** The cautions of docs/design.md §10, shown wherever results are shown. */
export function Cautions(props: { weights?: boolean; privacy?: boolean }) {
  return (
    <aside class="caution" aria-label="How to read these results">
      <p>
        <strong>Read with care.</strong> Themes describe which words occur together; they are not causes. A difference between groups is an
        association in this sample, not an effect.
        {props.weights !== false && ' Weighted shares are only as good as the survey weights; the intervals assume answers are independent of each other.'}
      </p>
      {props.privacy && <p>Answers can identify people. Exported files may carry personal data: keep them under your organisation's data-protection rules and ethics approval.</p>}
    </aside>
  );
}

export function Notice(props: { kind?: 'error' | 'ok' | 'info'; children: Child }) {
  return (
    <div class={`notice ${props.kind ?? 'info'}`} role={props.kind === 'error' ? 'alert' : 'status'}>
      {props.children}
    </div>
  );
}

export function percent(v: number, digits = 1): string {
  return Number.isFinite(v) ? `${(100 * v).toFixed(digits)}%` : '—';
}

export function count(n: number): string {
  return n.toLocaleString('en-GB');
}

export function when(iso: string | null | undefined): string {
  if (!iso) return '—';
  return iso.replace('T', ' ').slice(0, 16) + ' UTC';
}

export function duration(seconds: number | undefined): string {
  if (seconds === undefined || !Number.isFinite(seconds)) return '—';
  const s = Math.max(0, Math.round(seconds));
  if (s < 60) return `${s} s`;
  if (s < 3600) return `${Math.floor(s / 60)} min ${s % 60} s`;
  return `${Math.floor(s / 3600)} h ${Math.floor((s % 3600) / 60)} min`;
}

/** Page links for long lists; keeps the current query string. */
export function Pager(props: { base: string; query: Record<string, string | undefined>; offset: number; limit: number; total: number }) {
  const link = (offset: number) => {
    const q = new URLSearchParams();
    for (const [k, v] of Object.entries(props.query)) if (v !== undefined && v !== '') q.set(k, v);
    q.set('offset', String(offset));
    return `${props.base}?${q.toString()}`;
  };
  const end = Math.min(props.total, props.offset + props.limit);
  return (
    <nav class="pager" aria-label="Pages">
      <span>
        {props.total === 0 ? 'Nothing to show' : `${count(props.offset + 1)}–${count(end)} of ${count(props.total)}`}
      </span>
      {props.offset > 0 && <a href={link(Math.max(0, props.offset - props.limit))}>Previous</a>}
      {end < props.total && <a href={link(props.offset + props.limit)}>Next</a>}
    </nav>
  );
}
