/** The project a first start opens: the demo target with settings that are ready to run. */
import { DEFAULT_SETTINGS } from '../state/settings';
import { IDLE_RUN, PROJECT_FORMAT, PROJECT_VERSION, type Project } from '../state/project';
import { DEMO_NAME, demoTargetPoints } from './transferDemo';

export function createDemoProject(): Project {
  return {
    format: PROJECT_FORMAT,
    version: PROJECT_VERSION,
    name: DEMO_NAME,
    // The crank angles come along, so switching the timing to prescribed has values to use.
    target: { points: demoTargetPoints(), closed: true, timing: 'unprescribed', background: null },
    settings: DEFAULT_SETTINGS,
    run: IDLE_RUN,
    candidates: [],
    candidatesTarget: null,
  };
}
