/**
 * The motion of one toss, as a function of time: the hand carries the coin up and accelerates it
 * (constant acceleration from rest), releases it at `releaseTS` with the launch velocity, the coin
 * flies (ballistic centre, torque-free rotation of a symmetric top, from src/physics), is caught when
 * its centre comes back down to the catch height (solved exactly), and then rests in the hand, which
 * stops it over a short distance (constant deceleration); the orientation is frozen from the catch on.
 * Without the hand the clip starts at the release.
 *
 * References:
 * [1] "Dynamical bias in the coin toss", SIAM Review 49(2), 2007. DOI 10.1137/S0036144504446436
 *     (the coin's normal precesses about the fixed angular momentum at the angle ψ, rate |L|/I1).
 */
import {
  STANDARD_GRAVITY,
  add,
  attitudeAt,
  ballisticPosition,
  ballisticVelocity,
  cross,
  discInertia,
  flightTime,
  matColumn,
  matFromColumns,
  norm,
  normalize,
  precessionFrame,
  precessionFromState,
  scale,
  type DiscInertia,
  type Mat3,
  type PrecessionParams,
  type Vec3,
} from '../physics/index.ts';
import type { TossScenario } from './scenario.ts';

/** The coin (and hand) at one instant. */
export interface TossState {
  /** Time, s. */
  tS: number;
  /** Coin centre, world, m. */
  center: Vec3;
  /** Body → world rotation; column 2 is the heads normal. */
  attitude: Mat3;
  /** Heads normal, world. */
  normal: Vec3;
  /** Strictly between release and catch. */
  inFlight: boolean;
  /** The hand touches the coin (hand drawn and not in flight). */
  handContact: boolean;
  /** Anchor of the hand (where the coin sits when held), world, m; NaN without the hand. */
  handAnchor: Vec3;
}

/** A toss's motion and its key numbers. */
export interface TossMotion {
  readonly scenario: TossScenario;
  /** Per-kilogram moments of inertia of the coin, kg·m²/kg. */
  readonly inertia: DiscInertia;
  /** Angular momentum in flight (per kilogram), world. */
  readonly lVec: Vec3;
  /** Attitude at release (body → world). */
  readonly attitudeAtRelease: Mat3;
  /** Precession of the heads normal, with t = 0 at release. */
  readonly precession: PrecessionParams;
  /** Gravity used, m/s². */
  readonly gravity: number;
  readonly releaseTS: number;
  readonly catchTS: number;
  /** Time of the last instant of the clip, s. */
  readonly endTS: number;
  /** Centre at release and at the catch, world, m. */
  readonly releaseWorld: Vec3;
  readonly catchWorld: Vec3;
  /** Apex height above the release, m (u²/2g). */
  readonly apexHeightM: number;
  /** The state at time `tS` (s from the clip's start). */
  stateAt(tS: number): TossState;
}

const NAN3: Vec3 = [NaN, NaN, NaN];

/** Cubic Hermite between (p0, v0) at s = 0 and (p1, v1) at s = T, evaluated at s. */
function hermite(p0: Vec3, v0: Vec3, p1: Vec3, v1: Vec3, T: number, s: number): Vec3 {
  const x = Math.min(1, Math.max(0, s / T));
  const x2 = x * x;
  const x3 = x2 * x;
  const h00 = 2 * x3 - 3 * x2 + 1;
  const h10 = x3 - 2 * x2 + x;
  const h01 = -2 * x3 + 3 * x2;
  const h11 = x3 - x2;
  return [0, 1, 2].map((k) => h00 * p0[k] + h10 * T * v0[k] + h01 * p1[k] + h11 * T * v1[k]) as unknown as Vec3;
}

/**
 * Builds the motion of `scenario` under gravity `gravity` (m/s², default standard gravity).
 * The heads normal at release is the start face's normal at its closest approach to vertical
 * (precession phase 0 of `precessionFrame`): vertical when the tilt of L equals ψ.
 */
export function buildMotion(scenario: TossScenario, gravity: number = STANDARD_GRAVITY): TossMotion {
  const g = gravity;
  const inertia = discInertia(scenario.coinRadiusM, scenario.coinThicknessM);
  const beta = scenario.tiltRad;
  const az = scenario.lAzimuthRad;
  const lHat: Vec3 = [Math.sin(beta) * Math.cos(az), Math.sin(beta) * Math.sin(az), Math.cos(beta)];
  const { e1 } = precessionFrame(lHat);
  const psi = scenario.precessionRad;
  // the start face's outward normal, phase 0 (as high as the cone allows)
  const up = normalize(add(scale(lHat, Math.cos(psi)), scale(e1, Math.sin(psi))));
  const n0 = scenario.startFace === 'heads' ? up : scale(up, -1);
  const ref: Vec3 = Math.abs(n0[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
  const p = normalize(cross(n0, ref));
  const q = cross(n0, p);
  const tw = scenario.twistRad;
  const bx = normalize(add(scale(p, Math.cos(tw)), scale(q, Math.sin(tw))));
  const by = cross(n0, bx);
  const R0 = matFromColumns(bx, by, n0);
  const lVec = scale(lHat, 2 * Math.PI * scenario.spinRevS * inertia.i1);
  const precession = precessionFromState(n0, lVec, inertia);

  const v0: Vec3 = [...scenario.launchVelocityMS];
  const speed = norm(v0);
  const rRel: Vec3 = [...scenario.releaseWorld];
  const holdS = scenario.holdRiseM > 0 && speed > 0 ? (2 * scenario.holdRiseM) / speed : 0;
  const tRelease = scenario.restBeforeS + holdS;
  const flightS = flightTime(v0[2], g, scenario.catchDzM);
  if (!(flightS > 0)) throw new RangeError(`toss ${scenario.tossId}: the coin never comes back down to the catch height`);
  const tCatch = tRelease + flightS;
  const rCatch = ballisticPosition(rRel, v0, g, flightS);
  const vCatch = ballisticVelocity(v0, g, flightS);
  const catchSpeed = norm(vCatch);
  const stopS = catchSpeed > 0 ? (2 * scenario.catchSinkM) / catchSpeed : 0;
  const tEnd = tCatch + stopS + scenario.restAfterS;
  const Rcatch = attitudeAt(R0, lVec, inertia, flightS);
  const holdStart = add(rRel, scale(v0, -holdS / 2));

  // Hand during the flight: decelerates and drops 3 cm below the release, waits, rises to meet the coin.
  const low: Vec3 = [rRel[0], rRel[1], rRel[2] - 0.03];
  const awayS = Math.min(0.06, 0.3 * flightS);
  const backS = Math.min(0.08, 0.35 * flightS);
  const meet = scale(vCatch, 0.6);

  const centerAt = (tS: number): Vec3 => {
    if (tS <= tRelease) {
      if (tS <= scenario.restBeforeS || holdS === 0) return holdS === 0 ? add(rRel, scale(v0, tS - tRelease)) : holdStart;
      const s = tS - tRelease; // in [−holdS, 0]: r = r_r + v0 s + ½ (v0/T) s²
      return add(rRel, add(scale(v0, s), scale(v0, (0.5 * s * s) / holdS)));
    }
    if (tS < tCatch) return ballisticPosition(rRel, v0, g, tS - tRelease);
    const w = Math.min(tS - tCatch, stopS);
    if (stopS === 0) return rCatch;
    return add(rCatch, add(scale(vCatch, w), scale(vCatch, (-0.5 * w * w) / stopS)));
  };

  const stateAt = (tS: number): TossState => {
    const inFlight = tS > tRelease && tS < tCatch;
    let attitude: Mat3;
    if (tS <= tRelease) attitude = R0;
    else if (tS < tCatch) attitude = attitudeAt(R0, lVec, inertia, tS - tRelease);
    else attitude = Rcatch;
    const center = centerAt(tS);
    let handAnchor = NAN3;
    if (scenario.hand) {
      if (!inFlight) handAnchor = center;
      else {
        const s = tS - tRelease;
        if (s < awayS) handAnchor = hermite(rRel, v0, low, [0, 0, 0], awayS, s);
        else if (tS > tCatch - backS) handAnchor = hermite(low, [0, 0, 0], rCatch, meet, backS, tS - (tCatch - backS));
        else handAnchor = low;
      }
    }
    return {
      tS,
      center,
      attitude,
      normal: matColumn(attitude, 2),
      inFlight,
      handContact: scenario.hand && !inFlight,
      handAnchor,
    };
  };

  return {
    scenario,
    inertia,
    lVec,
    attitudeAtRelease: R0,
    precession,
    gravity: g,
    releaseTS: tRelease,
    catchTS: tCatch,
    endTS: tEnd,
    releaseWorld: rRel,
    catchWorld: rCatch,
    apexHeightM: (v0[2] * v0[2]) / (2 * g),
    stateAt,
  };
}
