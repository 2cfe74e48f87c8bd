/** Hands text to the browser as a file download (the one DOM-bound step of an export). */

/** Object URLs are released this long (ms) after the click, once the download has them. */
const REVOKE_AFTER_MS = 10_000;

export function downloadText(text: string, fileName: string, mimeType: string): void {
  const url = URL.createObjectURL(new Blob([text], { type: mimeType }));
  const link = document.createElement('a');
  link.href = url;
  link.download = fileName;
  link.style.display = 'none';
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), REVOKE_AFTER_MS);
}
