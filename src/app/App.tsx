/** The page frame: title, what Loci does, and the caution that must stay visible. */
const CAUTION_TEXT =
  'Loci computes kinematics only: no strength, stiffness or fatigue. A frame or walking machine must be checked by a qualified engineer and tested to the applicable standards (for bicycles, the ISO 4210 series) before anyone uses it.';

export function App() {
  return (
    <div className="app">
      <header className="app-header">
        <h1 className="app-title">Loci</h1>
        <p className="app-tagline">
          Fits planar four-bar and six-bar linkages to a target path: an axle path, a foot
          trajectory or a coupler curve.
        </p>
      </header>
      <aside className="caution" role="note" aria-label="Caution">
        <strong className="caution-label">Caution.</strong> {CAUTION_TEXT}
      </aside>
      <main className="app-main">
        <p>The design workspace is not built yet.</p>
      </main>
    </div>
  );
}
