/**
 * Generic fuzz layer, first half of the areas (see generic.ts). Fixed seeds.
 */
import { genericSuite, methodSuite, printTally } from './generic.js';

const FIRST = new Set(['camera', 'core', 'imaging', 'integrate', 'metrics', 'node']);
await genericSuite((a) => FIRST.has(a));
methodSuite();
printTally('generic-a');
