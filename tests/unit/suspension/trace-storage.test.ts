/**
 * The traced image and the path editor's image share the images store: loading a new
 * path-editor image drops the path editor's old ones, never the traced image.
 * (In memory: with no IndexedDB the store keeps images for the page only.)
 */
import { expect, it } from 'vitest';
import { TRACE_IMAGE_PREFIX, dropImagesExcept, getImage, putImage } from '../../../src/app/storage';

it('drops the old path-editor image and keeps the traced one', async () => {
  const traced = `${TRACE_IMAGE_PREFIX}one`;
  await putImage(null, traced, 'side.png', new Blob(['traced']));
  await putImage(null, 'image-old', 'old.png', new Blob(['old']));
  await putImage(null, 'image-new', 'new.png', new Blob(['new']));
  await dropImagesExcept(null, 'image-new');
  // common practice: one image per editor; each editor's image is its own.
  expect(await getImage(null, 'image-old')).toBeNull();
  expect(await (await getImage(null, 'image-new'))?.text()).toBe('new');
  expect(await (await getImage(null, traced))?.text()).toBe('traced');
});
