/**
 * Computes a clip's ground truth from its motion and camera: the toss-level values (flight,
 * rotation, faces, same-side probability, scale) and, per frame, the centre, the normal and the
 * exact perspective ellipse of the coin's mid-plane circle.
 *
 * References:
 * [1] "Dynamical bias in the coin toss", SIAM Review 49(2), 2007. DOI 10.1137/S0036144504446436
 *     (n·ẑ over the precession cycle, face changes and the same-side fraction).
 * [2] "Three-dimensional location estimation of circular features for machine vision",
 *     IEEE Transactions on Robotics and Automation 8(5), 1992. DOI 10.1109/70.163786 (the circle's image).
 */
import { faceChanges, norm, sameSideFraction, type Vec3 } from '../physics/index.ts';
import { projectCircle, projectPoint, viewCosine, worldToCamera, type PinholeCamera } from './camera.ts';
import type { TossMotion } from './motion.ts';
import type { Truth, TruthFrame } from './truth.ts';

const DEG = 180 / Math.PI;

/** What the truth records about how the clip was made. */
export interface TruthContext {
  /** The clip's file name (no folder). */
  file: string;
  containerFps: number;
  framesTotal: number;
  background: 'textured' | 'plain';
  exposureFraction: number;
  noiseSigma: number;
  codec: 'h264' | 'ffv1';
  seed: number;
}

/** The truth of one clip (numbers unrounded; {@link serializeTruth} rounds them). */
export function computeTruth(motion: TossMotion, cam: PinholeCamera, ctx: TruthContext): Truth {
  const sc = motion.scenario;
  const fps = sc.captureFps;
  const flightS = motion.catchTS - motion.releaseTS;
  const pr = motion.precession;
  const lHat = pr.lHat;
  const betaRad = Math.acos(Math.max(-1, Math.min(1, lHat[2]))); // L vs +ẑ, 0..π
  const psiHeads = pr.psiRad;
  const changes = faceChanges(psiHeads, betaRad, pr.omegaRadS, pr.phi0Rad, 0, flightS); // eq. of n·ẑ = 0 in [1]
  const atCatch = motion.stateAt(motion.catchTS);
  const predicted = atCatch.normal[2] > 0 ? 'heads' : 'tails';
  const startHeads = sc.startFace === 'heads';
  const depth = (p: Vec3): number => worldToCamera(cam, p)[2];
  const midFlight = motion.stateAt((motion.releaseTS + motion.catchTS) / 2).center; // depth is linear in t
  const frames: TruthFrame[] = [];
  for (let k = 0; k < ctx.framesTotal; k++) {
    const tS = k / fps;
    const st = motion.stateAt(tS);
    const e = projectCircle(cam, st.center, st.normal, sc.coinRadiusM);
    frames.push({
      frame: k,
      t_s: tS,
      in_flight: st.inFlight,
      hand_contact: st.handContact,
      center_world: [...st.center],
      center_px: projectPoint(cam, st.center),
      normal_world: [...st.normal],
      ellipse: e === null ? null : { cx: e.cx, cy: e.cy, major: e.major, minor: e.minor, angle_deg: e.angleRad * DEG },
      axis_ratio: e === null ? null : e.minor / e.major,
      n_dot_view: viewCosine(cam, st.center, st.normal),
    });
  }
  const v0 = sc.launchVelocityMS;
  return {
    toss_id: sc.tossId,
    file: ctx.file,
    capture_fps: fps,
    container_fps: ctx.containerFps,
    width: sc.width,
    height: sc.height,
    frames_total: ctx.framesTotal,
    coin_diameter_mm: sc.coinRadiusM * 2000,
    coin_thickness_mm: sc.coinThicknessM * 1000,
    focal_px: sc.focalPx,
    camera_distance_m: depth(motion.releaseWorld),
    camera_roll_deg: sc.cameraRollRad * DEG,
    release_t_s: motion.releaseTS,
    catch_t_s: motion.catchTS,
    flight_time_s: flightS,
    launch_speed_m_s: v0[2],
    apex_height_m: motion.apexHeightM,
    spin_rev_s: norm(motion.lVec) / motion.inertia.i1 / (2 * Math.PI),
    precession_deg: Math.min(psiHeads, Math.PI - psiHeads) * DEG,
    momentum_tilt_deg: Math.acos(Math.min(1, Math.abs(lHat[2]))) * DEG,
    face_changes: changes,
    start_face: sc.startFace,
    predicted_face: predicted,
    observed_face: predicted,
    same_side: predicted === sc.startFace,
    p_same_side: sameSideFraction(psiHeads, betaRad, startHeads),
    px_per_m: sc.focalPx / depth(midFlight),
    depth_change_m: depth(motion.catchWorld) - depth(motion.releaseWorld),
    tosser: sc.tosser,
    landing: 'caught',
    catch_height_m: sc.catchDzM,
    horizontal_speed_m_s: v0[0],
    depth_speed_m_s: v0[1],
    heads_psi_deg: psiHeads * DEG,
    phase0_deg: pr.phi0Rad * DEG,
    l_hat_world: [...lHat],
    gravity_m_s2: motion.gravity,
    hand: sc.hand,
    background: ctx.background,
    exposure_fraction: ctx.exposureFraction,
    noise_sigma: ctx.noiseSigma,
    codec: ctx.codec,
    seed: ctx.seed,
    clip_index: sc.clipIndex,
    frames,
  };
}
