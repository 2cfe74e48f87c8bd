/**
 * The rear-suspension workspace: the bicycle and the layout on the left; the side view
 * with its gear and travel controls, the figures at the sag point, and the curves over
 * the travel on the right. The caution stays at the top. The analysis runs once per
 * change of the design; the plots follow in React's deferred pass.
 */
import { memo, useDeferredValue, useMemo } from 'react';
import { SUSPENSION_CAUTION, SUSPENSION_CONVENTIONS, type SuspensionReport } from '../../core/suspension';
import { analyse } from './analysis';
import { BicyclePanel } from './BicyclePanel';
import { ExportPanel } from './ExportPanel';
import { readDraft } from './fields';
import { figure } from './labels';
import { LayoutPanel } from './LayoutPanel';
import { SearchPanel } from './search/SearchPanel';
import { SideView } from './SideView';
import { SuspensionPlots } from './SuspensionPlots';
import { useSuspension, useSuspensionDispatch } from './store';
import { readSearchProblem } from './targets/searchProblem';
import { TargetsPanel } from './targets/TargetsPanel';
import './suspension.css';

/** Kinematics only: shown on every suspension view. */
export function SuspensionCaution() {
  return (
    <aside className="susp-caution" role="note" aria-label="Suspension caution" data-testid="suspension-caution">
      <strong>Caution.</strong> {SUSPENSION_CAUTION}
    </aside>
  );
}

const PoseControls = memo(function PoseControls({ report, cogTeeth, chainringTeeth }: { report: SuspensionReport | null; cogTeeth: readonly number[]; chainringTeeth: number | null }) {
  const dispatch = useSuspensionDispatch();
  const cogIndex = useSuspension((s) => s.cogIndex);
  const travelStep = useSuspension((s) => s.travelStep);
  const cog = Math.min(cogIndex, Math.max(0, cogTeeth.length - 1));
  const steps = report?.curves.steps ?? 1;
  const step = Math.min(travelStep, steps - 1);
  const c = report?.curves;
  return (
    <div className="susp-pose">
      <label>
        Gear shown{' '}
        <select value={cog} onChange={(e) => dispatch({ type: 'cog', index: Number(e.target.value) })} disabled={cogTeeth.length === 0}>
          {cogTeeth.map((z, i) => <option key={i} value={i}>{`${chainringTeeth ?? '?'} × ${z} T (cog ${i + 1})`}</option>)}
        </select>
      </label>
      <label className="susp-travel">
        Travel{' '}
        <input
          type="range"
          min={0}
          max={steps - 1}
          step={1}
          value={step}
          disabled={report === null}
          aria-label="Wheel travel shown"
          onChange={(e) => dispatch({ type: 'travelStep', step: Number(e.target.value) })}
        />
        <output data-testid="travel-readout">
          {c === undefined
            ? 'full extension'
            : `${figure(c.travelMm[step])} mm of ${figure(report?.totalTravelMm ?? NaN)} mm wheel travel; shock ${figure(c.shockLengthMm[step])} mm (${figure(c.shockTravelMm[step])} mm into the stroke)`}
        </output>
      </label>
    </div>
  );
});

function Figures({ report, cogIndex }: { report: SuspensionReport; cogIndex: number }) {
  const s = report.sagPoint;
  const cog = Math.min(cogIndex, report.cogTeeth.length - 1);
  const rows: [string, string, string][] = [
    ['Wheel travel', figure(report.totalTravelMm), 'mm'],
    ['Leverage ratio at full extension', figure(report.leverageRatioStart), ''],
    ['Leverage ratio at the end of travel', figure(report.leverageRatioEnd), ''],
    ['Progression', figure(report.progressionPct, 3), '%'],
    ['Leverage ratio at sag', figure(s.leverageRatio), ''],
    [`Anti-squat at sag, ${report.chainringTeeth} × ${report.cogTeeth[cog]} T`, figure(s.antiSquatPct[cog], 3), '%'],
    ['Anti-rise at sag', figure(s.antiRisePct, 3), '%'],
    ['Rearward axle movement at sag', figure(s.rearwardMm, 3), 'mm'],
  ];
  if (s.wheelRateNPerMm !== null) rows.push(['Wheel rate at sag', figure(s.wheelRateNPerMm, 3), 'N/mm']);
  return (
    <table className="susp-figures" data-testid="suspension-figures">
      <caption>Figures</caption>
      <tbody>
        {rows.map(([what, value, unit]) => (
          <tr key={what}><th scope="row">{what}</th><td data-figure={what}>{value}</td><td>{unit}</td></tr>
        ))}
      </tbody>
    </table>
  );
}

export function SuspensionWorkspace({ onClose }: { onClose?: () => void }) {
  const dispatch = useSuspensionDispatch();
  const name = useSuspension((s) => s.name);
  const draft = useSuspension((s) => s.draft);
  const layout = useSuspension((s) => s.layout);
  const cogIndex = useSuspension((s) => s.cogIndex);
  const travelStep = useSuspension((s) => s.travelStep);
  // The fields' messages follow each keystroke; the curves, the side view and the plots
  // follow in React's deferred, interruptible pass, so typing and dragging stay quick.
  const reading = useMemo(() => readDraft(draft), [draft]);
  const deferredDraft = useDeferredValue(draft);
  const deferredLayout = useDeferredValue(layout);
  const analysedReading = useMemo(() => (deferredDraft === draft ? reading : readDraft(deferredDraft)), [deferredDraft, draft, reading]);
  const analysis = useMemo(() => analyse(analysedReading, deferredLayout), [analysedReading, deferredLayout]);
  const report = analysis.result !== null && analysis.result.ok ? analysis.result.report : null;
  const shownReport = useDeferredValue(report);
  const layoutProblem = analysis.result !== null && !analysis.result.ok ? analysis.result.reason : null;
  const bicycle = analysis.bicycle;
  const step = report === null ? 0 : Math.min(travelStep, report.curves.steps - 1);
  const shockLengthMm = bicycle === null ? null : report === null ? bicycle.shock.eyeToEyeMm : report.curves.shockLengthMm[step];
  const cogTeeth = bicycle?.cogTeeth ?? [];
  const cog = Math.min(cogIndex, Math.max(0, cogTeeth.length - 1));
  // The set-up's targets are drawn on the plots once the set-up reads as a problem.
  const search = useSuspension((s) => s.search);
  const deferredSearch = useDeferredValue(search);
  const targetsShown = useMemo(() => {
    const reading = readSearchProblem({ name, draft: deferredDraft, search: deferredSearch });
    return reading.ok ? reading.input : null;
  }, [name, deferredDraft, deferredSearch]);

  return (
    <div className="susp-workspace" data-testid="suspension-workspace">
      <div className="susp-title-row">
        <h2 className="susp-title">Rear suspension</h2>
        <label className="susp-name">
          Design name{' '}
          <input type="text" value={name} onChange={(e) => dispatch({ type: 'name', name: e.target.value })} />
        </label>
        {onClose !== undefined && <button type="button" onClick={onClose}>Back to path synthesis</button>}
      </div>
      <SuspensionCaution />
      <div className="susp-grid">
        <div className="susp-side">
          <BicyclePanel issues={reading.issues} />
          <LayoutPanel linkage={analysis.linkage} problem={layoutProblem} />
          <ExportPanel bicycle={bicycle} linkage={analysis.linkage} report={report} shockLengthMm={shockLengthMm} />
          <TargetsPanel />
        </div>
        <div className="susp-main">
          <section className="panel susp-panel" aria-labelledby="susp-view-title">
            <h2 id="susp-view-title" tabIndex={-1}>Side view</h2>
            <PoseControls report={report} cogTeeth={cogTeeth} chainringTeeth={bicycle?.chainringTeeth ?? null} />
            <SideView bicycle={bicycle} linkage={analysis.linkage} report={report} travelStep={step} cogIndex={cog} pivots={layout.pivots} />
            <p className="susp-note">Dashed: the instant-centre path of the axle-carrying body over the travel. Square pivots are on the front frame.</p>
          </section>
          <section className="panel susp-panel" aria-labelledby="susp-curves-title">
            <h2 id="susp-curves-title">Curves over the wheel travel</h2>
            {analysis.emptyReason !== null && <p className="susp-problem" role="status" data-testid="plots-empty">{analysis.emptyReason}</p>}
            {shownReport !== null && analysis.emptyReason === null && (
              <>
                <Figures report={shownReport} cogIndex={cog} />
                <SuspensionPlots report={shownReport} cogIndex={cog} sagShare={bicycle?.sag ?? 0} targets={targetsShown} />
              </>
            )}
            <details className="susp-conventions">
              <summary>How each figure is defined</summary>
              <ul>{SUSPENSION_CONVENTIONS.map((c) => <li key={c}>{c}</li>)}</ul>
            </details>
          </section>
          <SearchPanel />
        </div>
      </div>
    </div>
  );
}
