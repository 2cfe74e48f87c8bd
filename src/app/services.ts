/** What components reach besides the store: the search controller and storage. */
import { createContext, useContext } from 'react';
import type { SearchController } from './run/searchController';
import type { LociDb } from './storage';

export interface Services {
  readonly controller: SearchController;
  readonly db: LociDb | null;
}

export const ServicesContext = createContext<Services | null>(null);

export function useServices(): Services {
  const services = useContext(ServicesContext);
  if (services === null) throw new Error('useServices: no ServicesContext.Provider above this component');
  return services;
}
