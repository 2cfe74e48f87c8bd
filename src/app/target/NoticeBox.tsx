/** A message about the target: what an import read, or why it was refused (row by row). */
import type { Notice } from '../state/reducer';

export function NoticeBox({ notice, onClose }: { notice: Notice | null; onClose: () => void }) {
  if (notice === null) return null;
  return (
    <div className={`notice notice-${notice.kind}`} role={notice.kind === 'error' ? 'alert' : 'status'} data-testid="target-notice">
      <div className="notice-head">
        <strong>{notice.title}</strong>
        <button type="button" className="icon" aria-label="Dismiss message" onClick={onClose}>
          ×
        </button>
      </div>
      {notice.lines.length > 0 && (
        <ul>
          {notice.lines.map((line, i) => (
            <li key={i}>{line}</li>
          ))}
        </ul>
      )}
    </div>
  );
}
