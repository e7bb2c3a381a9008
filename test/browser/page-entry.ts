// Bundled for the page: the package's ESM build plus the shared scenario.
// The build may not exist when the project is type-checked (npm test runs before the
// build), so the import is resolved by esbuild only.
// @ts-ignore -- dist/ is produced by `npm run build`
import * as meniscus from '../../dist/index.js';
import { runScenario, type ScenarioModule } from './scenario.js';

const g = globalThis as { __meniscusResult?: unknown; __meniscusDone?: boolean };
g.__meniscusResult = runScenario(meniscus as unknown as ScenarioModule);
g.__meniscusDone = true;
