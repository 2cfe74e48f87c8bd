/** After a new target: the bounds and keep-out regions of the previous one were cleared; this offers them back. */
import { useDispatch, useWorkspace } from '../state/store';

export function SetAsideNotice() {
  const dispatch = useDispatch();
  const aside = useWorkspace((s) => s.ui.setAside);
  if (aside === null) return null;
  return (
    <div className="notice notice-info" role="status" data-testid="set-aside">
      <p className="notice-head">New target: cleared what was set in the previous target's frame ({aside.what}).</p>
      <div className="row-actions">
        <button type="button" onClick={() => dispatch({ type: 'settings/set-aside', restore: true })}>
          Keep them for this target
        </button>
        <button type="button" onClick={() => dispatch({ type: 'settings/set-aside', restore: false })}>
          Leave them cleared
        </button>
      </div>
    </div>
  );
}
