/** The object URL of a background image kept in IndexedDB (a blob: URL, local to the page), revoked when no longer shown. */
import { useEffect, useState } from 'react';
import { useServices } from '../services';
import { getImage } from '../storage';

export function useImageUrl(imageId: string | null): string | null {
  const { db } = useServices();
  const [shown, setShown] = useState<{ id: string; url: string } | null>(null);
  useEffect(() => {
    if (imageId === null) return;
    let cancelled = false;
    let url: string | null = null;
    void getImage(db, imageId).then((blob) => {
      if (cancelled || blob === null) return;
      url = URL.createObjectURL(blob);
      setShown({ id: imageId, url });
    });
    return () => {
      cancelled = true;
      if (url !== null) URL.revokeObjectURL(url);
    };
  }, [db, imageId]);
  return shown !== null && shown.id === imageId ? shown.url : null;
}
