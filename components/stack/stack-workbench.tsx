'use client';

import { useRouter } from 'next/navigation';
import { useMemo, useState, useTransition } from 'react';
import { saveStackAction } from '@/app/(lab)/projects/[projectId]/revisions/[revisionId]/stack/actions';
import { ContrastCurveChart, CURVE_MAX, CURVE_MIN } from '@/components/charts/contrast-curve-chart';
import { Button } from '@/components/ui/button';
import { EmptyState, Notice, Panel } from '@/components/ui/panel';
import { listStackTemplates, type StackPrediction, type StackTemplateId } from '@/lib/optics';
import type { StackElement, StackElementKind, VariantStacks } from '@/lib/schemas/stack';
import { ElementCard } from './element-card';
import { formatLuminance, formatPercent, formatRatio } from './format';
import {
  applyWhatIf,
  ELEMENT_KINDS,
  fromDraft,
  isWhatIfActive,
  newElement,
  NO_WHAT_IF,
  safePredict,
  serverErrorsToStackErrors,
  toDraft,
  validateDrafts,
  type DraftElement,
  type MeasuredPoint,
  type StackErrors,
  type WhatIf,
} from './planner-model';
import { VariantPredictedMeasured, VariantStacksEditor } from './variant-stacks';
import { WhatIfSliders } from './what-if-sliders';
import { TradeOffChart } from './trade-off-chart';
import { fromVariantDrafts, placeMeasured, plannerVariants, predictedAgainstMeasuredByVariant, toVariantDrafts, tradeOffPoints, type HandednessCheck, type TradeOffPoint, type VariantDraft } from './workbench-model';
import { median } from './planner-model';

const TEMPLATES = listStackTemplates();

function Figure({ testId, label, value, reference, help }: { testId: string; label: React.ReactNode; value: string; reference?: string | null; help?: string }) {
  return (
    <div className="rounded-md border border-line bg-canvas/60 px-3 py-2">
      <dt className="text-xs uppercase tracking-wider text-muted" title={help}>
        {label}
      </dt>
      <dd className="mt-0.5 font-mono text-lg tabular-nums text-ink" data-testid={testId}>
        {value}
      </dd>
      {reference ? <dd className="text-xs text-muted">stack: {reference}</dd> : null}
    </div>
  );
}

// Uppercase labels would turn η and τ into look-alikes of H and T.
const Sym = ({ children }: { children: string }) => <span className="font-serif text-sm normal-case">{children}</span>;

function handednessText(p: StackPrediction): string {
  const n = p.reflections;
  return p.handedness === 'kept'
    ? `Upright, not mirrored (${n} reflections)`
    : `Mirrored (${n} reflection${n === 1 ? '' : 's'}): show a flipped image`;
}

const sideOf = (mirrored: boolean | 'mixed', turned: boolean | 'mixed'): string =>
  mirrored === 'mixed' ? 'mixed: some sets mirrored, some not' : `${mirrored ? 'mirrored' : 'not mirrored'}${turned === true ? ', turned 180°' : turned === 'mixed' ? ', some turned' : ''}`;

/** Per variant, what the orientation marker showed through the optics beside what its stack predicts. */
function MeasuredHandedness({ checks }: { checks: { variant: string; handedness: HandednessCheck }[] }) {
  const shown = checks.filter((c) => c.handedness.measured);
  if (shown.length === 0) {
    return <dd className="mt-1 text-xs text-muted">Not measured yet: analyse a capture set with the orientation marker (pattern “orientation”) to check it.</dd>;
  }
  return (
    <>
      {shown.map(({ variant, handedness: h }) => (
        <dd key={variant} className="mt-1 text-xs" data-testid="measured-handedness">
          <span className="text-muted">Measured{variant ? ` (${variant})` : ''}, {h.measured!.sets} set{h.measured!.sets === 1 ? '' : 's'}: </span>
          <span className="text-ink">{sideOf(h.measured!.mirrored, h.measured!.turned)}</span>
          {h.agrees === null ? null : h.agrees ? (
            <span className="ml-1 text-pass">— as the stack predicts</span>
          ) : (
            <span className="ml-1 text-fail">— the stack predicts {h.predicted === 'mirrored' ? 'a mirrored' : 'an upright'} image: count the reflections again</span>
          )}
        </dd>
      ))}
    </>
  );
}

function PredictionFigures({ shown, base, checks }: { shown: StackPrediction; base: StackPrediction | null; checks: { variant: string; handedness: HandednessCheck }[] }) {
  // The stack's own value is repeated only where a slider has moved the figure.
  const ref = (a: string, b: string | undefined) => (base && b !== undefined && a !== b ? b : null);
  const eta = formatPercent(shown.eta);
  const tau = formatPercent(shown.tau);
  const atEye = formatLuminance(shown.displayAtEye);
  const g = shown.ghost;
  return (
    <dl className="grid grid-cols-2 gap-2 sm:grid-cols-3">
      <Figure testId="pred-eta" label={<>Display efficiency <Sym>η</Sym></>} value={eta} reference={ref(eta, base ? formatPercent(base.eta) : undefined)} help="Share of the display's light that reaches the eye" />
      <Figure testId="pred-tau" label={<>See-through <Sym>τ</Sym></>} value={tau} reference={ref(tau, base ? formatPercent(base.tau) : undefined)} help="Share of the world's light that reaches the eye" />
      <Figure testId="pred-at-eye" label="Display at the eye" value={atEye} reference={ref(atEye, base ? formatLuminance(base.displayAtEye) : undefined)} />
      <Figure testId="pred-ghost-s" label="Ghost ratio, s" value={g ? formatPercent(g.s) : 'no splitter'} />
      <Figure testId="pred-ghost-p" label="Ghost ratio, p" value={g ? formatPercent(g.p) : 'no splitter'} />
      <Figure
        testId="pred-ghost-u"
        label="Ghost ratio, unpolarised"
        value={g ? formatPercent(g.unpolarised) : 'no splitter'}
        reference={g && base?.ghost ? ref(formatPercent(g.unpolarised), formatPercent(base.ghost.unpolarised)) : null}
      />
      <div className="col-span-2 rounded-md border border-line bg-canvas/60 px-3 py-2 sm:col-span-3">
        <dt className="text-xs uppercase tracking-wider text-muted">Image handedness</dt>
        <dd className="mt-0.5 text-sm text-ink" data-testid="pred-handedness">
          {handednessText(shown)}
        </dd>
        <MeasuredHandedness checks={checks} />
      </div>
    </dl>
  );
}

export function StackWorkbench({
  projectId,
  revisionId,
  revisionLabel,
  initialElements,
  storedComplete,
  canWrite,
  measured,
  cautions,
  initialVariantStacks = {},
}: {
  projectId: string;
  revisionId: string;
  revisionLabel: string;
  initialElements: StackElement[];
  storedComplete: boolean;
  canWrite: boolean;
  measured: MeasuredPoint[];
  cautions: React.ReactNode;
  initialVariantStacks?: VariantStacks;
}) {
  const router = useRouter();
  const [drafts, setDrafts] = useState<DraftElement[]>(() => initialElements.map((e, i) => toDraft(e, `stored-${i}`)));
  const [saved, setSaved] = useState<StackElement[]>(initialElements);
  const [savedJson, setSavedJson] = useState<string | null>(() => (storedComplete ? JSON.stringify({ elements: initialElements }) : null));
  const [whatIf, setWhatIf] = useState<WhatIf>(NO_WHAT_IF);
  const [variantDrafts, setVariantDrafts] = useState<Record<string, VariantDraft>>(() => toVariantDrafts(initialVariantStacks));
  const [savedVariantJson, setSavedVariantJson] = useState<string>(() => JSON.stringify(initialVariantStacks));
  const [serverErrors, setServerErrors] = useState<StackErrors>({});
  const [status, setStatus] = useState<{ ok: boolean; message: string } | null>(null);
  const [templateId, setTemplateId] = useState<StackTemplateId>('birdbath');
  const [addKind, setAddKind] = useState<StackElementKind>('plate-beam-splitter');
  const [pending, startTransition] = useTransition();
  const readOnly = !canWrite;

  const { stack, errors: clientErrors } = useMemo(() => validateDrafts(drafts), [drafts]);
  const errors = useMemo(() => {
    const merged: StackErrors = { ...clientErrors };
    for (const [k, v] of Object.entries(serverErrors)) merged[k] = [...new Set([...(merged[k] ?? []), ...v])];
    return merged;
  }, [clientErrors, serverErrors]);
  const prediction = useMemo(() => safePredict(stack), [stack]);
  const whatIfActive = isWhatIfActive(whatIf);
  const whatIfStack = useMemo(() => (stack && whatIfActive ? applyWhatIf(stack, whatIf) : null), [stack, whatIf, whatIfActive]);
  const whatIfPrediction = useMemo(() => safePredict(whatIfStack), [whatIfStack]);
  const shown = whatIfPrediction ?? prediction;

  const variantState = useMemo(() => fromVariantDrafts(variantDrafts, drafts.length), [variantDrafts, drafts.length]);
  const variantNames = useMemo(() => [...new Set([...plannerVariants(measured, variantState.value ?? {}), ...Object.keys(variantDrafts)])].sort((a, b) => a.localeCompare(b)), [measured, variantState, variantDrafts]);
  const currentJson = stack ? JSON.stringify(stack) : JSON.stringify({ elements: drafts.map(fromDraft) });
  const currentVariantJson = JSON.stringify(variantState.value ?? variantDrafts);
  const dirty = (currentJson !== savedJson && !(savedJson === null && drafts.length === 0)) || currentVariantJson !== savedVariantJson;

  // typed backgrounds first, then calibrated ones, then the EXIF estimate (marked on the chart)
  const { plotted, unplotted } = placeMeasured(measured, CURVE_MIN, CURVE_MAX);
  const estimated = plotted.filter((p) => p.estimate).length;
  const perVariant = useMemo(() => predictedAgainstMeasuredByVariant(stack, variantState.value ?? {}, measured), [stack, variantState, measured]);
  // the team's background: the median of its readings' (typed, else from the photos), else an office-bright 1,000 cd/m²
  const teamBackground = median(plotted.map((p) => p.x)) ?? 1000;
  const tradeOff: TradeOffPoint[] = [
    ...tradeOffPoints(stack, teamBackground),
    ...perVariant.flatMap((v): TradeOffPoint[] =>
      v.tauMeasured !== null && v.acrMeasured !== null ? [{ label: `measured: ${v.variant || 'no variant label'}`, split: '', polariser: false, tau: v.tauMeasured, acr: v.acrMeasured, kind: 'measured' }] : [],
    ),
  ];

  function edit(next: DraftElement[]) {
    setDrafts(next);
    setServerErrors({});
    setStatus(null);
  }

  function updateValue(index: number, name: string, value: string) {
    edit(drafts.map((d, i) => (i === index ? { ...d, values: { ...d.values, [name]: value } } : d)));
  }

  function move(index: number, delta: -1 | 1) {
    const j = index + delta;
    if (j < 0 || j >= drafts.length) return;
    const next = [...drafts];
    const [item] = next.splice(index, 1);
    if (item) next.splice(j, 0, item);
    edit(next);
  }

  function applyTemplate() {
    const t = TEMPLATES.find((x) => x.id === templateId);
    if (!t) return;
    if (drafts.length > 0 && !window.confirm(`Replace the ${drafts.length} element${drafts.length === 1 ? '' : 's'} of this stack with “${t.name}”? Unsaved edits are lost; the saved stack stays until you save.`)) return;
    edit(t.stack.elements.map((e) => toDraft(e)));
    setWhatIf(NO_WHAT_IF);
  }

  function addElement() {
    const el = newElement(addKind);
    // The display has to lead the list, so it goes to the top.
    edit(addKind === 'display' ? [el, ...drafts] : [...drafts, el]);
  }

  function applyWhatIfToStack() {
    if (!whatIfStack) return;
    edit(whatIfStack.elements.map((e) => toDraft(e)));
    setWhatIf(NO_WHAT_IF);
  }

  function revert() {
    edit(saved.map((e) => toDraft(e)));
    setWhatIf(NO_WHAT_IF);
  }

  function save() {
    if (!stack) {
      setStatus({ ok: false, message: 'Fix the highlighted fields first; nothing was saved.' });
      return;
    }
    if (!variantState.value) {
      setStatus({ ok: false, message: 'Fix the variants’ parts first; nothing was saved.' });
      return;
    }
    const json = JSON.stringify(stack);
    const variantJson = JSON.stringify(variantState.value);
    const form = new FormData();
    form.set('projectId', projectId);
    form.set('revisionId', revisionId);
    form.set('stack', json);
    form.set('variantStacks', variantJson);
    const submitted = stack.elements;
    startTransition(async () => {
      const res = await saveStackAction({}, form);
      if (res.ok) {
        setSavedJson(json);
        setSavedVariantJson(variantJson);
        setSaved(submitted);
        setServerErrors({});
        router.refresh();
      } else {
        setServerErrors(serverErrorsToStackErrors(res.fieldErrors));
      }
      setStatus({ ok: !!res.ok, message: res.message ?? (res.ok ? 'Saved' : 'Not saved') });
    });
  }

  const stackErrors = errors._stack;

  return (
    <div className="grid gap-6 xl:grid-cols-[minmax(0,1fr)_minmax(0,1.15fr)]">
      <Panel
        title={`Stack of ${revisionLabel}`}
        actions={
          canWrite ? (
            <span data-testid="save-state" className={dirty ? 'text-xs text-warn' : 'text-xs text-muted'}>
              {dirty ? 'Unsaved changes' : 'Saved'}
            </span>
          ) : (
            <span data-testid="read-only" className="rounded border border-line px-2 py-0.5 text-xs text-muted">
              Read-only
            </span>
          )
        }
      >
        <div className="space-y-4">
          <p className="text-xs text-muted">
            List the parts in the order the display’s light meets them, from the display to the eye. In a birdbath, list the splitter once, before the combiner.
          </p>
          {readOnly ? (
            <Notice tone="info">Your role can view this stack and try the sliders, but only leads and admins can change and save it.</Notice>
          ) : (
            <div className="flex flex-wrap items-end gap-2 rounded-md border border-line bg-raised/50 p-3">
              <label className="text-sm">
                <span className="mb-1 block text-muted">Starting template</span>
                <select
                  value={templateId}
                  onChange={(e) => setTemplateId(e.target.value as StackTemplateId)}
                  className="rounded-md border border-line bg-canvas px-3 py-2 text-ink"
                >
                  {TEMPLATES.map((t) => (
                    <option key={t.id} value={t.id}>
                      {t.name}
                    </option>
                  ))}
                </select>
              </label>
              <Button type="button" tone="quiet" onClick={applyTemplate}>
                Apply template
              </Button>
              <p className="basis-full text-xs text-muted">{TEMPLATES.find((t) => t.id === templateId)?.description}</p>
            </div>
          )}

          {!storedComplete && initialElements.length > 0 ? (
            <Notice>The stored stack was incomplete; the parts that could be read are loaded below.</Notice>
          ) : null}

          {drafts.length === 0 ? (
            <EmptyState title="No stack yet">
              {canWrite ? 'Start from a template above, or add the display and its parts one by one.' : 'A lead has not described this revision’s optics yet.'}
            </EmptyState>
          ) : (
            <ol className="space-y-3" aria-label="Stack elements">
              {drafts.map((d, i) => (
                <ElementCard
                  key={d.key}
                  draft={d}
                  index={i}
                  count={drafts.length}
                  errors={errors}
                  readOnly={readOnly}
                  onChange={(name, value) => updateValue(i, name, value)}
                  onMove={(delta) => move(i, delta)}
                  onRemove={() => edit(drafts.filter((_, j) => j !== i))}
                />
              ))}
            </ol>
          )}

          {stackErrors?.length && drafts.length > 0 ? (
            <p role="alert" data-testid="stack-error" className="text-sm text-fail">
              {stackErrors.join(' ')}
            </p>
          ) : null}

          {canWrite ? (
            <div className="flex flex-wrap items-end gap-2 border-t border-line pt-4">
              <label className="text-sm">
                <span className="mb-1 block text-muted">Add a part</span>
                <select value={addKind} onChange={(e) => setAddKind(e.target.value as StackElementKind)} className="rounded-md border border-line bg-canvas px-3 py-2 text-ink">
                  {ELEMENT_KINDS.map((k) => (
                    <option key={k.kind} value={k.kind}>
                      {k.name}
                    </option>
                  ))}
                </select>
              </label>
              <Button type="button" tone="quiet" onClick={addElement}>
                Add
              </Button>
              <div className="ml-auto flex items-center gap-2">
                {dirty && saved.length > 0 ? (
                  <Button type="button" tone="quiet" onClick={revert} disabled={pending}>
                    Revert to saved
                  </Button>
                ) : null}
                <Button type="button" onClick={save} disabled={pending || drafts.length === 0}>
                  {pending ? 'Saving…' : 'Save stack'}
                </Button>
              </div>
              {status ? (
                <p role={status.ok ? 'status' : 'alert'} data-testid="save-status" className={`basis-full text-sm ${status.ok ? 'text-pass' : 'text-fail'}`}>
                  {status.message}
                </p>
              ) : null}
            </div>
          ) : null}
        </div>
      </Panel>

      <div className="space-y-6">
        <Panel title="Planner" actions={whatIfActive ? <span className="text-xs text-glow">what-if active</span> : null}>
          {shown && stack ? (
            <div className="space-y-5">
              <PredictionFigures shown={shown} base={whatIfActive ? prediction : null} checks={perVariant} />
              <div>
                <h3 className="mb-1 text-xs uppercase tracking-wider text-muted">Ambient contrast ratio against the background</h3>
                <ContrastCurveChart
                  stack={prediction ? prediction.curve.map((p) => ({ x: p.backgroundLuminance, y: p.ratio })) : null}
                  whatIf={whatIfPrediction ? whatIfPrediction.curve.map((p) => ({ x: p.backgroundLuminance, y: p.ratio })) : null}
                  measured={plotted}
                />
                <div className="mt-1 flex flex-wrap gap-4 text-xs text-muted">
                  <span>
                    <span className="mr-1 inline-block h-0.5 w-5 align-middle bg-beam" /> stack prediction
                  </span>
                  {whatIfPrediction ? (
                    <span>
                      <span className="mr-1 inline-block h-0.5 w-5 border-t-2 border-dashed border-glow align-middle" /> what-if
                    </span>
                  ) : null}
                  <span>
                    <span className="mr-1 inline-block h-2.5 w-2.5 rounded-full bg-glow align-middle" /> measured ({plotted.length - estimated})
                  </span>
                  {estimated ? (
                    <span data-testid="estimated-count">
                      <span className="mr-1 inline-block h-2.5 w-2.5 rounded-full border-2 border-glow align-middle" /> background estimated from EXIF ({estimated})
                    </span>
                  ) : null}
                </div>
              </div>
              <TradeOffChart points={tradeOff} backgroundCdm2={teamBackground} estimated={plotted.some((p) => p.estimate)} />
              <div className="rounded-md border border-line p-3">
                <h3 className="mb-3 text-xs uppercase tracking-wider text-muted">What if…</h3>
                <WhatIfSliders
                  stack={stack}
                  whatIf={whatIf}
                  onChange={setWhatIf}
                  onReset={() => setWhatIf(NO_WHAT_IF)}
                  onApply={applyWhatIfToStack}
                  canApply={canWrite}
                />
              </div>
            </div>
          ) : (
            <EmptyState title="No prediction yet">
              {drafts.length === 0 ? 'Describe the stack to see η, τ, the ghost ratio and the contrast curve.' : 'The stack has errors; fix the highlighted fields to see the prediction.'}
            </EmptyState>
          )}
        </Panel>

        <Panel title="Variants">
          <VariantStacksEditor names={variantNames} base={drafts} drafts={variantDrafts} errors={variantState.errors} readOnly={readOnly} onChange={(next) => { setVariantDrafts(next); setStatus(null); }} />
        </Panel>

        {cautions}
      </div>

      {/* full width: the per-variant table has ten columns */}
      <Panel title={`Measured on ${revisionLabel}`} className="xl:col-span-2">
        {measured.length === 0 ? (
          <p data-testid="no-readings" className="text-sm text-muted">
            No readings yet for this revision. Once capture sets are analysed, each one appears on the curve at its recorded background luminance.
          </p>
        ) : (
          <div className="space-y-2 text-sm">
            <p className="text-muted" data-testid="plotted-count">
              {plotted.length} of {measured.length} newest readings are on the chart{estimated ? `, ${estimated} at a background estimated from the photos’ EXIF (marked as estimates; a typed or calibrated value is used where there is one)` : ''}.
            </p>
            <VariantPredictedMeasured rows={perVariant} csvName={`${revisionLabel}-predicted-vs-measured-per-variant`} />
            {unplotted.length ? (
              <ul data-testid="unplotted-readings" className="space-y-1">
                {unplotted.map(({ point, why }) => (
                  <li key={point.captureSetId} className="flex justify-between gap-3 rounded border border-line px-2 py-1">
                    <span className="text-ink">
                      {point.variant || 'reading'} · {formatRatio(point.ambientContrastRatio)}
                    </span>
                    <span className="text-xs text-muted">{why}</span>
                  </li>
                ))}
              </ul>
            ) : null}
          </div>
        )}
      </Panel>

    </div>
  );
}
