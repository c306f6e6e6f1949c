// What a fit will cost, shown under the Runs form before anyone presses "Start run" (issue 15):
// time and memory for the settings on the form, updated when a field changes, and a warning when
// the study is larger than this machine can fit.
import { count, Notice } from './components.js';

export interface EstimateView {
  readonly answers: number;
  readonly line: string;
  readonly notes: readonly string[];
  readonly fits: boolean;
}

/** The fields the estimate depends on; sent when one of them changes. */
const FIELDS = ['themes', 'sweeps', 'threads', 'holdout'].map((n) => `#new-run-form [name='${n}']`).join(', ');

export function FitEstimatePanel(props: { studyId: number; estimate: EstimateView | null; error?: string }) {
  return (
    <div
      id="fit-estimate"
      role="status"
      hx-get={`/studies/${props.studyId}/runs/estimate`}
      hx-trigger="change from:#new-run-form"
      hx-include={FIELDS}
      hx-swap="outerHTML"
    >
      {props.error && <p class="hint">{props.error}</p>}
      {props.estimate && (
        <>
          <p class="hint">
            {count(props.estimate.answers)} answers will be used. Estimated: {props.estimate.line}
          </p>
          {props.estimate.notes.map((n) => (props.estimate!.fits ? <p class="hint">{n}</p> : <Notice kind="error">{n}</Notice>))}
        </>
      )}
    </div>
  );
}
