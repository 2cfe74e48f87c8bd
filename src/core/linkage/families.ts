/**
 * Builders of the standard families from reference-pose positions (mm), with fixed ids
 * so synthesis, tests and demos can name their parts. Each is driven by a link turning
 * about a ground pivot (the driver value is the absolute angle of pivot → tip) and
 * carries one output point `P`. Each has a default reference pose of workable
 * proportions, `…_DEFAULT`, used by demos and tests.
 *
 * Ground joints end in 0 (A0, B0, C0, G0). Which links are ternary and which inversion
 * each six-bar is are stated per builder. The inversion names (Watt I and II, Stephenson
 * I, II and III, by which link of the chain is the frame) are from memory of common
 * textbook usage; verify against a mechanism handbook before quoting them.
 */
import type { Vec2 } from '../geometry';
import type { Linkage } from './model';

function ground(id: string, at: Vec2) {
  return { id, x: at.x, y: at.y, ground: true };
}

function moving(id: string, at: Vec2) {
  return { id, x: at.x, y: at.y };
}

/** Positions of a four-bar: ground pivots A0 and B0, crank pin A, rocker pin B, coupler point P. */
export interface FourBarPositions {
  readonly A0: Vec2;
  readonly B0: Vec2;
  readonly A: Vec2;
  readonly B: Vec2;
  readonly P: Vec2;
}

/** Crank 40, coupler ≈ 106, rocker ≈ 79.6, ground 100 (mm): a Grashof crank-rocker. */
export const FOUR_BAR_DEFAULT: FourBarPositions = {
  A0: { x: 0, y: 0 },
  B0: { x: 100, y: 0 },
  A: { x: 24, y: 32 },
  B: { x: 120, y: 77 },
  P: { x: 90, y: 110 },
};

/**
 * Four-bar: bodies `crank` [A0, A] (driven about A0, tip A), `coupler` [A, B] carrying
 * P, `rocker` [B0, B]. All binary; dyads place it.
 */
export function fourBar(at: FourBarPositions = FOUR_BAR_DEFAULT): Linkage {
  return {
    joints: [ground('A0', at.A0), ground('B0', at.B0), moving('A', at.A), moving('B', at.B)],
    bodies: [
      { id: 'crank', joints: ['A0', 'A'] },
      { id: 'coupler', joints: ['A', 'B'] },
      { id: 'rocker', joints: ['B0', 'B'] },
    ],
    points: [{ id: 'P', body: 'coupler', x: at.P.x, y: at.P.y }],
    driver: { kind: 'rotation', body: 'crank', pivot: 'A0', tip: 'A' },
  };
}

/** Positions of a slider-crank: crank pivot A0, crank pin A, slider pin B, point P on the rod; the slide's direction. */
export interface SliderCrankPositions {
  readonly A0: Vec2;
  readonly A: Vec2;
  readonly B: Vec2;
  readonly P: Vec2;
  /** Direction (rad) of the ground line B slides on; the line passes through B. */
  readonly slideAngleRad: number;
}

/** Crank 50, rod ≈ 143, slide offset 10 (mm) along +x: the crank turns fully. */
export const SLIDER_CRANK_DEFAULT: SliderCrankPositions = {
  A0: { x: 0, y: 0 },
  A: { x: 30, y: 40 },
  B: { x: 170, y: 10 },
  P: { x: 100, y: 60 },
  slideAngleRad: 0,
};

/**
 * Slider-crank: bodies `crank` [A0, A] (driven about A0, tip A) and `rod` [A, B]
 * carrying P; B slides on a ground line. Placed by a circle–line dyad.
 */
export function sliderCrank(at: SliderCrankPositions = SLIDER_CRANK_DEFAULT): Linkage {
  return {
    joints: [ground('A0', at.A0), moving('A', at.A), moving('B', at.B)],
    bodies: [
      { id: 'crank', joints: ['A0', 'A'] },
      { id: 'rod', joints: ['A', 'B'] },
    ],
    sliders: [{ joint: 'B', body: 'ground', angle: at.slideAngleRad }],
    points: [{ id: 'P', body: 'rod', x: at.P.x, y: at.P.y }],
    driver: { kind: 'rotation', body: 'crank', pivot: 'A0', tip: 'A' },
  };
}

/** Positions of a Watt I six-bar. */
export interface WattIPositions {
  readonly A0: Vec2;
  readonly B0: Vec2;
  readonly A: Vec2;
  readonly B: Vec2;
  /** Third joint of the crank. */
  readonly C: Vec2;
  /** Third joint of the coupler. */
  readonly D: Vec2;
  /** Joint of the two dyad links. */
  readonly E: Vec2;
  readonly P: Vec2;
}

export const WATT_I_DEFAULT: WattIPositions = {
  A0: { x: 0, y: 0 },
  B0: { x: 100, y: 0 },
  A: { x: 24, y: 32 },
  B: { x: 120, y: 77 },
  C: { x: -20, y: 25 },
  D: { x: 80, y: 120 },
  E: { x: 20, y: 140 },
  P: { x: 50, y: 150 },
};

/**
 * Watt I (the frame is a binary link; the two ternary links, `crank` and `coupler`, are
 * joined at A): the four-bar A0-A-B-B0 with ternary `crank` [A0, A, C] (driven about
 * A0, tip A) and ternary `coupler` [A, B, D], `rocker` [B0, B], and the dyad `link1`
 * [C, E], `link2` [D, E] (carrying P) joining crank and coupler. Dyads place it.
 */
export function wattI(at: WattIPositions = WATT_I_DEFAULT): Linkage {
  return {
    joints: [
      ground('A0', at.A0), ground('B0', at.B0),
      moving('A', at.A), moving('B', at.B), moving('C', at.C), moving('D', at.D), moving('E', at.E),
    ],
    bodies: [
      { id: 'crank', joints: ['A0', 'A', 'C'] },
      { id: 'coupler', joints: ['A', 'B', 'D'] },
      { id: 'rocker', joints: ['B0', 'B'] },
      { id: 'link1', joints: ['C', 'E'] },
      { id: 'link2', joints: ['D', 'E'] },
    ],
    points: [{ id: 'P', body: 'link2', x: at.P.x, y: at.P.y }],
    driver: { kind: 'rotation', body: 'crank', pivot: 'A0', tip: 'A' },
  };
}

/** Positions of a Watt II six-bar. */
export interface WattIIPositions {
  readonly A0: Vec2;
  readonly B0: Vec2;
  readonly C0: Vec2;
  readonly A: Vec2;
  readonly B: Vec2;
  /** Third joint of the rocker. */
  readonly C: Vec2;
  readonly D: Vec2;
  readonly P: Vec2;
}

export const WATT_II_DEFAULT: WattIIPositions = {
  A0: { x: 0, y: 0 },
  B0: { x: 100, y: 0 },
  C0: { x: 250, y: 60 },
  A: { x: 24, y: 32 },
  B: { x: 120, y: 77 },
  C: { x: 150, y: 20 },
  D: { x: 200, y: 100 },
  P: { x: 190, y: 130 },
};

/**
 * Watt II (the frame is a ternary link, A0-B0-C0, joined at B0 to the other ternary,
 * `rocker` [B0, B, C]): two four-bars in series, `crank` [A0, A] (driven about A0,
 * tip A), `coupler` [A, B], `rocker`; then `rocker`, `coupler2` [C, D] (carrying P),
 * `output` [C0, D]. Dyads place it.
 */
export function wattII(at: WattIIPositions = WATT_II_DEFAULT): Linkage {
  return {
    joints: [
      ground('A0', at.A0), ground('B0', at.B0), ground('C0', at.C0),
      moving('A', at.A), moving('B', at.B), moving('C', at.C), moving('D', at.D),
    ],
    bodies: [
      { id: 'crank', joints: ['A0', 'A'] },
      { id: 'coupler', joints: ['A', 'B'] },
      { id: 'rocker', joints: ['B0', 'B', 'C'] },
      { id: 'coupler2', joints: ['C', 'D'] },
      { id: 'output', joints: ['C0', 'D'] },
    ],
    points: [{ id: 'P', body: 'coupler2', x: at.P.x, y: at.P.y }],
    driver: { kind: 'rotation', body: 'crank', pivot: 'A0', tip: 'A' },
  };
}

/** Positions of a Stephenson I six-bar. */
export interface StephensonIPositions {
  readonly A0: Vec2;
  readonly B0: Vec2;
  readonly A: Vec2;
  readonly B: Vec2;
  /** Third joint of the crank. */
  readonly C: Vec2;
  /** Third joint of the rocker. */
  readonly D: Vec2;
  /** Joint of the two dyad links. */
  readonly E: Vec2;
  readonly P: Vec2;
}

export const STEPHENSON_I_DEFAULT: StephensonIPositions = {
  A0: { x: 0, y: 0 },
  B0: { x: 100, y: 0 },
  A: { x: 24, y: 32 },
  B: { x: 120, y: 77 },
  C: { x: -20, y: 25 },
  D: { x: 140, y: 30 },
  E: { x: 60, y: -60 },
  P: { x: 10, y: -80 },
};

/**
 * Stephenson I (the frame is a binary link joining the two ternary links, which are not
 * joined to each other): the four-bar A0-A-B-B0 with ternary `crank` [A0, A, C]
 * (driven about A0, tip A), `coupler` [A, B], ternary `rocker` [B0, B, D], and the dyad
 * `link1` [C, E] (carrying P), `link2` [D, E] joining crank and rocker. Dyads place it.
 */
export function stephensonI(at: StephensonIPositions = STEPHENSON_I_DEFAULT): Linkage {
  return {
    joints: [
      ground('A0', at.A0), ground('B0', at.B0),
      moving('A', at.A), moving('B', at.B), moving('C', at.C), moving('D', at.D), moving('E', at.E),
    ],
    bodies: [
      { id: 'crank', joints: ['A0', 'A', 'C'] },
      { id: 'coupler', joints: ['A', 'B'] },
      { id: 'rocker', joints: ['B0', 'B', 'D'] },
      { id: 'link1', joints: ['C', 'E'] },
      { id: 'link2', joints: ['D', 'E'] },
    ],
    points: [{ id: 'P', body: 'link1', x: at.P.x, y: at.P.y }],
    driver: { kind: 'rotation', body: 'crank', pivot: 'A0', tip: 'A' },
  };
}

/** Positions of a Stephenson II six-bar. */
export interface StephensonIIPositions {
  readonly A0: Vec2;
  readonly G0: Vec2;
  /** Joints of the crank (with A0). */
  readonly A: Vec2;
  readonly B: Vec2;
  /** Joints of the floating ternary. */
  readonly C: Vec2;
  readonly D: Vec2;
  readonly E: Vec2;
  readonly P: Vec2;
}

export const STEPHENSON_II_DEFAULT: StephensonIIPositions = {
  A0: { x: 0, y: 0 },
  G0: { x: 170, y: 0 },
  A: { x: 20, y: 0 },
  B: { x: 0, y: 20 },
  C: { x: 100, y: 80 },
  D: { x: 60, y: 110 },
  E: { x: 130, y: 70 },
  P: { x: 80, y: 130 },
};

/**
 * Stephenson II (the frame is a binary link, A0-G0, joined to only one ternary link):
 * ternary `crank` [A0, A, B] (driven about A0, tip A), `link1` [A, C], `link2` [B, D],
 * floating ternary `coupler` [C, D, E] (carrying P), `rocker` [G0, E]. Driven by its
 * ternary crank, no dyad places C, D or E: they form one Newton–Raphson block.
 */
export function stephensonII(at: StephensonIIPositions = STEPHENSON_II_DEFAULT): Linkage {
  return {
    joints: [
      ground('A0', at.A0), ground('G0', at.G0),
      moving('A', at.A), moving('B', at.B), moving('C', at.C), moving('D', at.D), moving('E', at.E),
    ],
    bodies: [
      { id: 'crank', joints: ['A0', 'A', 'B'] },
      { id: 'link1', joints: ['A', 'C'] },
      { id: 'link2', joints: ['B', 'D'] },
      { id: 'coupler', joints: ['C', 'D', 'E'] },
      { id: 'rocker', joints: ['G0', 'E'] },
    ],
    points: [{ id: 'P', body: 'coupler', x: at.P.x, y: at.P.y }],
    driver: { kind: 'rotation', body: 'crank', pivot: 'A0', tip: 'A' },
  };
}

/** Positions of a Stephenson III six-bar. */
export interface StephensonIIIPositions {
  readonly A0: Vec2;
  readonly B0: Vec2;
  readonly C0: Vec2;
  readonly A: Vec2;
  readonly B: Vec2;
  /** Third joint of the coupler. */
  readonly C: Vec2;
  /** Tip of the input link. */
  readonly D: Vec2;
  readonly P: Vec2;
}

export const STEPHENSON_III_DEFAULT: StephensonIIIPositions = {
  A0: { x: 0, y: 0 },
  B0: { x: 100, y: 0 },
  C0: { x: 150, y: 120 },
  A: { x: -15, y: 70 },
  B: { x: 105, y: 60 },
  C: { x: 40, y: 100 },
  D: { x: 170, y: 115 },
  P: { x: 50, y: 130 },
};

/**
 * Stephenson III (the frame is a ternary link, A0-B0-C0; the other ternary, `coupler`
 * [A, B, C] carrying P, is not joined to it): the four-bar A0-A-B-B0 (`rockerA` [A0, A],
 * `coupler`, `rockerB` [B0, B]) with the dyad `connector` [D, C], `input` [C0, D] from
 * the coupler to the frame, driven by `input` about C0 (tip D). From that side no dyad
 * places A, B or C: they form one Newton–Raphson block.
 */
export function stephensonIII(at: StephensonIIIPositions = STEPHENSON_III_DEFAULT): Linkage {
  return {
    joints: [
      ground('A0', at.A0), ground('B0', at.B0), ground('C0', at.C0),
      moving('A', at.A), moving('B', at.B), moving('C', at.C), moving('D', at.D),
    ],
    bodies: [
      { id: 'rockerA', joints: ['A0', 'A'] },
      { id: 'coupler', joints: ['A', 'B', 'C'] },
      { id: 'rockerB', joints: ['B0', 'B'] },
      { id: 'connector', joints: ['D', 'C'] },
      { id: 'input', joints: ['C0', 'D'] },
    ],
    points: [{ id: 'P', body: 'coupler', x: at.P.x, y: at.P.y }],
    driver: { kind: 'rotation', body: 'input', pivot: 'C0', tip: 'D' },
  };
}
