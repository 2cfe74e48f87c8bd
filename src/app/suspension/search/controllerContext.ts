/**
 * The workspace's one search controller: made where the workspace opens (SuspensionEntry),
 * so closing the workspace can ask before it stops a running search, and read by the
 * search panel.
 */
import { createContext, useContext } from 'react';
import type { SuspensionSearchController } from './controller';

export const SearchControllerContext = createContext<SuspensionSearchController | null>(null);

export function useSearchController(): SuspensionSearchController {
  const controller = useContext(SearchControllerContext);
  if (controller === null) throw new Error('useSearchController: no SearchControllerContext.Provider above this component');
  return controller;
}
