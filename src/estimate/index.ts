/** Per-toss estimation: re-exports only. */
export { estimateToss, MIN_FLIGHT_FRAMES, MIN_FRAMES_PER_REV, type Face, type ObservedFrame, type TossContext, type TossEstimate } from './estimateToss.ts';
export { fitRotation, type RotationFit, type RotationFitOptions } from './fitRotation.ts';
export { fitFlight, type FlightFit, type FlightInput } from './fitFlight.ts';
export { findFlightWindow, type FlightWindow, type TrackPoint } from './findFlightWindow.ts';
export { levenbergMarquardt, type LmOptions, type LmResult } from './levenbergMarquardt.ts';
export { robustLinearFit, type RobustFitOptions, type RobustFitResult } from './robustLinearFit.ts';
export { lombScargle } from './periodogram.ts';
export { silhouetteVariances } from './silhouetteMoments.ts';
export { circleImageMajor, nearFaceMagnification, viewGeometry, type ViewGeometry } from './viewGeometry.ts';
