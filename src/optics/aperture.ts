// Apertures and illumination in SI units, and the facts about them that the planner needs. The
// element kinds live in src/elements/ (one file each); the geometry they share in geometry.ts.
export type { Aperture } from '../elements/registry.js';
export { apertureFacts, separableProfiles, isOneDAperture, gratingOf, isRound, describe } from '../elements/registry.js';
export { profileFacts, type ApertureFacts, type ApertureGeometry, type Illumination, type Profile, type ProfileFacts } from './geometry.js';
