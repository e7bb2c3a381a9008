// Bundled for the page: the package's ESM build plus the shared scenario.
import * as meniscus from '../../dist/index.js';
import { runScenario, type ScenarioModule } from './scenario.js';

const g = globalThis as { __meniscusResult?: unknown; __meniscusDone?: boolean };
g.__meniscusResult = runScenario(meniscus as unknown as ScenarioModule);
g.__meniscusDone = true;
