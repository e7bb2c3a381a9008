/**
 * Generic fuzz layer, second half of the areas (see generic.ts). Fixed seeds.
 */
import { genericSuite, printTally } from './generic.js';

const FIRST = new Set(['camera', 'core', 'imaging', 'integrate', 'metrics', 'node']);
await genericSuite((a) => !FIRST.has(a));
printTally('generic-b');
