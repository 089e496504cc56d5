// Area-sampled aperture masks: each element samples itself (the cells: mask-cells.ts).
export { sampleProfile, sampleGeometry } from './mask-cells.js';
export { apertureMask as sampleMask2D } from '../elements/registry.js';
