/** The "tell me when the queue is done" box: the browser is asked only when it is ticked, and a refusal is said. */
import { useEffect, useState } from 'react';
import type { LociDb } from '../storage';
import { loadNotifyWish, saveNotifyWish } from '../storage/queueStore';
import { askToNotify, notifyPermission } from './notify';

export function NotifyChoice({ db, disabled }: { db: LociDb; disabled: boolean }) {
  const [wish, setWish] = useState(false);
  const [note, setNote] = useState<string | null>(null);
  useEffect(() => {
    let cancelled = false;
    void loadNotifyWish(db).then((w) => {
      if (cancelled) return;
      // A wish kept from an earlier visit holds only while the browser still allows notices.
      setWish(w && notifyPermission() === 'granted');
      if (w && notifyPermission() === 'denied') setNote('Notifications are blocked for this page in the browser\'s settings; the summary will be here when the queue is done.');
    }, () => {});
    return () => {
      cancelled = true;
    };
  }, [db]);
  const change = async (on: boolean) => {
    if (!on) {
      setWish(false);
      setNote(null);
      await saveNotifyWish(db, false).catch(() => {});
      return;
    }
    const answer = await askToNotify();
    if (answer === 'granted') {
      setWish(true);
      setNote(null);
      await saveNotifyWish(db, true).catch((error: unknown) => setNote(`The choice could not be saved: ${error instanceof Error ? error.message : String(error)}`));
      return;
    }
    setWish(false);
    setNote(answer === 'unsupported'
      ? 'This browser cannot show notifications; the summary will be here when the queue is done.'
      : answer === 'denied'
        ? 'The browser refused to show notifications for this page (it can be allowed again in the site settings); the summary will be here when the queue is done.'
        : 'The browser was not given an answer, so no notification will be shown; tick the box again to be asked again.');
  };
  return (
    <div className="field-row">
      <label>
        <input type="checkbox" checked={wish} disabled={disabled} onChange={(e) => void change(e.target.checked)} /> Tell me when the queue is done (a browser notification)
      </label>
      {note !== null && <span className="field-error" role="status" data-testid="notify-note">{note}</span>}
    </div>
  );
}
