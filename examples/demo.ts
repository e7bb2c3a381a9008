/**
 * `npm run demo`: the end-to-end demonstration. Until the full pipeline lands, it prints
 * the optics table (refraction and Fresnel transmittance through a flat water surface).
 */
import { opticsTable } from './optics-table.js';

console.log(opticsTable());
