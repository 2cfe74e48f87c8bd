/** The results views: ranked table, detail, compare and exports (contract: notes/app-api.md). */
export { ResultsView } from './ResultsView';
export type { ResultsViewProps } from './ResultsView';
export type { ResultsTarget } from './types';
