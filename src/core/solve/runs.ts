// Solves each run: poses, yaw readings and targets, wheel and motor degrees,
// times; and the checks that follow from them (wrap point, swept footprint,
// walls, time limit, marks).
import type {
  Diagnostic, DiagnosticCode, DriveStmt, Fix, MarkStmt, PathPiece, PlanSetup, Point, Pose, Range,
  ResetYawStmt, RunResult, Segment, Severity, SquareStmt, StartStmt, TurnShape, TurnStmt, WaitStmt,
} from '../types';
import { footprintOf, forwardVector, rightVector, rotatePose, wrapReading, type Footprint } from './frame';
import { shortWay, YawReadings } from './readings';
import { encoderTurnTime, gyroTurnTime, profileTime } from './timing';
import { MOTION_CAP_S, restState, simRobot, simulateMotion } from '../sim/motion';
import { PoseBuffer, rigidPiece, simplify } from '../sim/path';
import { propagateRun, shares, spreadCentre, zeroes, type SpreadSource } from '../spread/run';
import { markProbability } from '../spread/gaussian';
import { squareUp, wallsOf } from './square';
import { sweepPiece, overlapsAt, type SweepHit } from './sweep';
import { fmt } from '../units/evaluate';
import { DIFFERS_MM, predictedPath, predictRun, SIMULATION_BUDGET_S, type RunPrediction, type SimBudget } from '../sim/run';
import { tuneGyroTurn, tuningFix, unstallGyroTurn } from '../sim/tune';

export type EvaluatedMotion =
  | { stmt: StartStmt; at?: Point; heading?: number }
  | { stmt: DriveStmt; distance?: number; speed?: number; speedIsLinear: boolean; hold?: number; gain?: number; ramp?: number }
  | { stmt: TurnStmt; angle?: number; to?: number; radius?: number; ratio?: number; speed?: number; min?: number; gain?: number; stop?: number }
  | { stmt: SquareStmt; speed?: number }
  | { stmt: WaitStmt; time?: number }
  | { stmt: MarkStmt; at?: Point; heading?: number; within?: number; level?: number }
  | { stmt: ResetYawStmt };

export interface RunInput {
  name: string;
  line: number;
  range: Range;
  motions: EvaluatedMotion[];
  implicit?: boolean;
}

export const MOTION_DEFAULTS = {
  drivePower: 0.5,
  driveGain: 2,
  turnPower: 0.5,
  turnMin: 0.1,
  turnGain: 1,
  turnStop: 1,
  squarePower: 0.5,
  markWithin: 20,
  markHeadingWithin: 3,
  /** Degrees from the wrap point where sensor noise flips the reading. */
  wrapEdge: 5,
  /** A hold differing from the reading by more than this starts with a swerve. */
  headingJump: 2,
} as const;

const RAD = Math.PI / 180;

export function solveRuns(inputs: RunInput[], setup: PlanSetup, diagnostics: Diagnostic[], options: { simulate?: boolean } = {}): RunResult[] {
  const robot = setup.robot;
  const footprint = footprintOf(robot);
  /** How far any part of the footprint reaches from the axle midpoint. */
  const reach = footprint.kind === 'circle' ? footprint.radius
    : Math.hypot(footprint.length / 2 + Math.abs(footprint.axle), footprint.width / 2);
  const walls = wallsOf(setup.field, setup.obstacles);
  const { lo, hi } = setup.yawRange;
  const turns = setup.turns;
  const report = (range: Range, severity: Severity, code: DiagnosticCode, message: string, extra?: Partial<Diagnostic>) => {
    const d: Diagnostic = { range, severity, code, message };
    if (extra) Object.assign(d, extra);
    diagnostics.push(d);
    return d;
  };
  let wheelReported = false;
  let trackReported = false;
  const needWheel = (range: Range): boolean => {
    if (robot.wheelDiameter !== undefined) return true;
    if (!wheelReported) {
      report(range, 'error', 'setup', 'the wheel diameter is not set, so wheel and motor degrees and times cannot be computed: add a line such as `wheel 56 mm` before the first motion.');
      wheelReported = true;
    }
    return false;
  };
  const needTrack = (range: Range): boolean => {
    if (robot.track !== undefined) return true;
    if (!trackReported) {
      report(range, 'error', 'setup', 'the track width (distance between the wheels) is not set, so turns cannot be computed: add a line such as `track 120 mm` before the first turn.');
      trackReported = true;
    }
    return false;
  };

  /** Wheel surface speed at full power, mm/s (undefined without a wheel). */
  const fullSpeed = (): number | undefined =>
    robot.wheelDiameter === undefined || robot.motorSpeed === undefined || robot.gear === undefined
      ? undefined
      : ((robot.motorSpeed / robot.gear) * Math.PI * robot.wheelDiameter) / 360;
  const wheelDegrees = (travel: number): number | undefined =>
    robot.wheelDiameter === undefined ? undefined : (travel / (Math.PI * robot.wheelDiameter)) * 360;

  const results: RunResult[] = [];
  const budget: SimBudget = { seconds: SIMULATION_BUDGET_S };
  for (const input of inputs) {
    const segments: Segment[] = [];
    let pose: Pose | undefined;
    // The reading the plan means, and the sensor's reading in the same run
    // with a zero at every crossing a zero can fix (what the crossings' fixes
    // make of it): a crossing whose target is in range there only follows
    // from an earlier one.
    const yaw = new YawReadings(lo, hi);
    const fixedYaw = new YawReadings(lo, hi);
    let root: Diagnostic | undefined;
    const zero = (heading: number) => { yaw.zero(heading); fixedYaw.zero(heading); root = undefined; };
    let wrapCrossings = 0;
    /** Set by a `square` against a box until the next move is checked. */
    let squaredAgainst: { obstacle?: Obstacle; away: Point } | undefined;
    const reading = (p: Pose) => yaw.sensor(p.heading);
    const motionOf = new Map<Segment, EvaluatedMotion>();
    /** The box a square presses against: the moves on and off it touch it. */
    const squareWall = new Map<Segment, Obstacle>();

    for (const m of input.motions) {
      const pushedBefore = segments.length;
      solveMotion(m);
      for (let i = pushedBefore; i < segments.length; i++) motionOf.set(segments[i], m);
    }

    // What the real robot does: every motion simulated in order.
    const prediction: RunPrediction = options.simulate === false ? { events: [] } : predictRun(segments, (seg) => motionOf.get(seg), setup, footprint, walls, budget);
    reportPrediction(prediction);
    spreadRun();

    function solveMotion(m: EvaluatedMotion): void {
      const s = m.stmt;
      if (s.kind === 'start') {
        const sm = m as Extract<EvaluatedMotion, { stmt: StartStmt }>;
        if (pose) {
          report(s.range, 'error', 'setup', 'a run has one `start`; this one would teleport the robot. Begin a new `run "NAME"` before it, or remove it.');
          return;
        }
        pose = { x: sm.at?.x ?? 0, y: sm.at?.y ?? 0, heading: sm.heading ?? 0 };
        zero(pose.heading);
        const seg = baseSegment(s.line, 'start', pose, pose, yaw.zeroReading, yaw.zeroReading);
        seg.complete = sm.at !== undefined && sm.heading !== undefined;
        segments.push(seg);
        for (const hit of overlapsAt(pose, footprint, turns, setup.obstacles, setup.field)) reportHit(hit, s.range, 'the start pose', seg);
        return;
      }
      if (!pose) {
        report(s.range, 'error', 'setup', `the run "${input.name}" has no \`start\` before its first motion: add a line such as \`start (200, 200) heading 0\` to place the robot.`);
        pose = { x: 0, y: 0, heading: 0 };
        zero(0);
      }
      const yawBefore = reading(pose);
      switch (s.kind) {
        case 'resetYaw': {
          zero(pose.heading);
          segments.push(baseSegment(s.line, 'reset', pose, pose, yawBefore, yaw.zeroReading));
          break;
        }
        case 'wait': {
          const wm = m as Extract<EvaluatedMotion, { stmt: WaitStmt }>;
          const seg = baseSegment(s.line, 'wait', pose, pose, yawBefore, yawBefore);
          if (wm.time !== undefined && wm.time < 0) report(s.time.range, 'error', 'setup', 'a wait cannot be negative.');
          seg.duration = Math.max(0, wm.time ?? 0);
          seg.complete = wm.time !== undefined;
          segments.push(seg);
          break;
        }
        case 'mark': {
          const mm = m as Extract<EvaluatedMotion, { stmt: MarkStmt }>;
          const seg = baseSegment(s.line, 'mark', pose, pose, yawBefore, yawBefore);
          seg.label = s.name.value;
          const zone = s.inZone ? setup.zones.find((z) => z.name === s.inZone!.value) : undefined;
          if (zone) seg.markTarget = { kind: 'zone', name: zone.name, min: zone.min, max: zone.max };
          else if (mm.at) seg.markTarget = { kind: 'point', at: mm.at, within: mm.within ?? MOTION_DEFAULTS.markWithin };
          segments.push(seg);
          checkMark(mm, pose);
          break;
        }
        case 'drive':
          pose = solveDrive(m as Extract<EvaluatedMotion, { stmt: DriveStmt }>, pose);
          break;
        case 'turn':
          pose = solveTurn(m as Extract<EvaluatedMotion, { stmt: TurnStmt }>, pose);
          break;
        case 'square':
          pose = solveSquare(m as Extract<EvaluatedMotion, { stmt: SquareStmt }>, pose);
          break;
      }
      yaw.settle(pose.heading);
    }

    // A motion whose time cannot be computed has an error of its own; the run's total is then unknown (Infinity), never short.
    const duration = segments.reduce((t, sg) => t + sg.duration, 0);

    const distance = segments.reduce((t, sg) => t + sg.distance, 0);
    const result: RunResult = {
      name: input.name, line: input.line, range: input.range, segments, duration, distance,
      turns: segments.filter((sg) => sg.kind === 'turn').length, wrapCrossings,
      ...(prediction.duration !== undefined ? { predictedDuration: prediction.duration } : {}),
    };
    if (setup.limit !== undefined && Number.isFinite(duration) && duration > setup.limit) {
      report(input.range, 'warning', 'over-time',
        `the run "${input.name}" takes about ${fmt(duration, 1)} s, over the ${fmt(setup.limit, 1)} s limit by ${fmt(duration - setup.limit, 1)} s: raise speeds, add ramps to long drives, or drop a task.`);
    }
    results.push(result);

    // -- per-segment solvers (closures over the run's state) ----------------

    /**
     * The simulation's findings: gyro-turn times, overshoot, stall and the
     * cap, and collisions of the predicted path where it leaves the planned one.
     */
    function reportPrediction(pr: RunPrediction): void {
      const crossed = new Set(diagnostics.filter((d) => d.code === 'wrap-cross').map((d) => d.range.start.line));
      // A line with an error of its own (a speed of 0 %, a negative gain) is not reported again for what follows from it.
      const erred = new Set(diagnostics.filter((d) => d.severity === 'error').map((d) => d.range.start.line));
      for (const seg of segments) {
        // The simulation gives a gyro turn's time (spec section 8); the closed form stays where it cannot.
        const p = seg.predicted;
        if (seg.kind === 'turn' && seg.sensing === 'gyro' && p && Number.isFinite(p.duration) && !p.capped && !p.stalled) seg.duration = p.duration;
      }
      if (pr.budgetStop) {
        const at = motionOf.get(pr.budgetStop)?.stmt;
        if (at) {
          report(at.range, 'information', 'approximate',
            `The prediction of the real robot stops here: this plan is longer than the ${fmt(SIMULATION_BUDGET_S / 3600, 1)} hours of robot time each check simulates, so the motions from this line on have no predicted path, time or findings.`);
        }
      }
      for (const ev of pr.events) {
        const seg = ev.seg;
        const p = seg.predicted!;
        const stmt = stmtOf(seg);
        if (!stmt || erred.has(seg.line)) continue;
        const at = { x: p.end.x, y: p.end.y };
        if (ev.kind === 'capped') {
          if (crossed.has(seg.line)) continue; // reported once, at the crossing
          report(stmt.range, 'error', 'endless',
            `This motion never ends on the robot: after ${MOTION_CAP_S} s of simulated time its code is still waiting${seg.sensing === 'gyro' ? ' for the yaw reading to come within the stop band (the robot rocks about the target, or creeps too slowly to reach it)' : ' for the wheels to reach their targets'}. ${seg.kind === 'turn' && seg.sensing === 'gyro' ? 'Widen the stop band a little, or lower `min` and `gain`.' : 'Check the speed, the motor and the wheel.'}`,
            { at });
          continue;
        }
        if (ev.kind === 'stall') {
          const stall = robot.stall ?? 0;
          if (stmt.kind === 'turn' && seg.sensing === 'gyro') {
            const short = Math.abs(p.overshoot ?? 0);
            const fix = unstallGyroTurn(seg);
            const current = currentTurnSettings(seg);
            report(stmt.range, 'error', 'stall',
              `The robot stops ${fmt(short, 1)}° short of the target and waits for ever: near the target the controller gives ${fmt(current.min * 100)} % power (\`min\`), below the ${fmt(stall * 100)} % the wheels need to move (the stall power). ${fix ? `Raise \`min\` to ${fmt(fix.value! * 100)} % (predicted: ${fmt(fix.duration, 2)} s, ${fmt(Math.abs(fix.overshoot), 1)}° ${fix.overshoot >= 0 ? 'past' : 'short of'} the target).` : 'Raise `min` above the stall power.'}`,
              { at, ...(fix ? { fixes: [tuningFix(fix, stmt, current, true)] } : {}) });
          } else {
            report(stmt.range, 'error', 'stall',
              `The robot does not move: the wheels get ${fmt((seg.power ?? 0) * 100)} % power or less, below the ${fmt(stall * 100)} % they need to move (the stall power), so the code waits for ever. Raise \`speed\` above ${fmt(stall * 100)} %.`,
              { at });
          }
          continue;
        }
        // Overshoot past the stop band. What helps most follows from how the turn arrives: at its
        // floor (`min` decides the speed it coasts from), a wider stop band lets it coast onto the
        // target; on its gain, a lower gain slows it sooner. The fixes, each with the simulation's
        // result in its title, are worked out when asked for (a search of simulations per turn).
        if (stmt.kind !== 'turn') continue;
        const stop = simStop(seg) ?? MOTION_DEFAULTS.turnStop;
        const current = currentTurnSettings(seg);
        const floorBound = (current.gain / 100) * stop <= current.min;
        const helps = floorBound
          ? `widen the stop band (\`stop\`), so the power stops earlier and the robot coasts onto the target, or lower \`min\``
          : 'lower `gain`, so the robot slows down sooner, or add `ramp`';
        const d = report(stmt.range, 'warning', 'overshoot',
          `The robot overshoots: it is predicted to end ${fmt(p.overshoot!, 1)}° past the target once the wheels run down, more than the ${fmt(stop)}° stop band (it turns at up to ${fmt(p.peakRate, 0)}°/s and the motors take ${fmt((robot.motorLag ?? 0) * 1000, 0)} ms to stop). What helps most: ${helps}; the quick fixes give values the simulation shows work.`,
          { at });
        const first = floorBound ? ['stop', 'min'] : ['gain', 'ramp'];
        lazyFixes(d, () => {
          const options = tuneGyroTurn(seg).sort((a, b) => Number(first.indexOf(b.option) >= 0) - Number(first.indexOf(a.option) >= 0));
          return options.map((t, i) => tuningFix(t, stmt, current, i === 0));
        });
      }
      // The predicted path, where it leaves the planned one, checked like it
      // (against what the planned path of the same line does not already hit).
      const hitOnLine = new Map<number, Set<string>>();
      for (const d of diagnostics) {
        if (d.code !== 'collision' && d.code !== 'off-field') continue;
        const set = hitOnLine.get(d.range.start.line) ?? new Set<string>();
        set.add(d.code === 'off-field' ? 'field' : d.message);
        hitOnLine.set(d.range.start.line, set);
      }
      for (let i = 0; i < segments.length; i++) {
        const seg = segments[i];
        const bounds = seg.predicted?.bounds;
        if (!bounds || seg.kind === 'square') continue;
        const stmt = stmtOf(seg);
        if (!stmt) continue;
        const wallNow = squareWall.get(seg);
        const wallBefore = i > 0 ? squareWall.get(segments[i - 1]) : undefined;
        // Broad phase: only what lies near the box the robot passes through is swept against.
        // (Samples are at most a control-loop step apart: the arcs between them bulge far less than BOUNDS_SLACK.)
        const grow = reach + BOUNDS_SLACK;
        const minX = bounds.minX - grow, minY = bounds.minY - grow, maxX = bounds.maxX + grow, maxY = bounds.maxY + grow;
        let obstacles: Obstacle[] | undefined;
        for (const o of setup.obstacles) {
          if (o !== wallNow && o !== wallBefore && nearBox(o, minX, minY, maxX, maxY)) (obstacles ??= []).push(o);
        }
        const field = setup.field && !(minX > 0 && minY > 0 && maxX < setup.field.width && maxY < setup.field.height) ? setup.field : undefined;
        if (!obstacles && !field) continue;
        const path = predictedPath(seg) ?? [];
        const already = hitOnLine.get(seg.line);
        const seen = new Set<string>();
        for (const piece of path) {
          for (const hit of sweepPiece(piece, footprint, turns, obstacles ?? [], field)) {
            const key = hit.kind === 'field' ? 'field' : `o:${hit.obstacle?.name}`;
            if (seen.has(key)) continue;
            seen.add(key);
            if (already && (hit.kind === 'field' ? already.has('field') : [...already].some((m) => m.includes(`"${hit.obstacle!.name}"`)))) continue;
            const off = seg.predicted!.end;
            const drift = Math.hypot(off.x - seg.end.x, off.y - seg.end.y);
            const what = hit.kind === 'field' ? 'leaves the field' : `hits the ${hit.obstacle!.kind} "${hit.obstacle!.name}"`;
            report(stmt.range, 'warning', hit.kind === 'field' ? 'off-field' : 'collision',
              `The predicted path ${what} here, though the planned path clears it: the real robot is ${fmt(drift, 0)} mm off the plan at the end of this motion (the motors' lag, coasting${(robot.mismatch ?? 1) !== 1 ? ', the wheel mismatch' : ''} and the controller's overshoot). Leave more room, or use ramps so the robot stops where planned.`,
              { at: hit.at, ...(hit.pose ? { pose: hit.pose } : {}) });
          }
        }
      }
    }

    /**
     * The spread of where the robot ends up at every segment (robot model,
     * section 3), and the chance of meeting each mark. (`miss` does not use
     * it yet: issue 10.)
     */
    function spreadRun(): void {
      const width = robot.effectiveTrack ?? robot.track;
      if (width === undefined || !(width > 0)) return;
      const { bySegment } = propagateRun(segments, setup.noise, width, turns);
      for (const [seg, sp] of bySegment) seg.spread = sp;
      for (const seg of segments) {
        const m = motionOf.get(seg);
        const target = seg.markTarget;
        if (seg.kind !== 'mark' || !seg.spread || !m || !target) continue;
        const mm = m as Extract<EvaluatedMotion, { stmt: MarkStmt }>;
        // About where the robot is predicted to end (the controller simulation), where there is a prediction: the
        // spread is of the real robot, and the sampled runs (which simulate it) scatter about that pose.
        const center = spreadCentre(seg);
        seg.hitProbability = markProbability(target, center, { xx: seg.spread.cov[0][0], xy: seg.spread.cov[0][1], yy: seg.spread.cov[1][1] });
        const level = mm.level !== undefined && mm.level >= 0.5 && mm.level < 1 ? mm.level : MARK_LEVEL;
        if (seg.hitProbability >= level) continue;
        // The planned pose itself missing is reported already; this is the spread making it a gamble.
        if (diagnostics.some((d) => d.code === 'miss' && d.range.start.line === seg.line)) continue;
        const share = shares(segments, seg, setup.noise, width, turns);
        const top = (Object.keys(share) as SpreadSource[]).reduce((a, b) => (share[b] > share[a] ? b : a));
        const lastReset = [...segments.slice(0, segments.indexOf(seg))].reverse().find(zeroes);
        const where = target.kind === 'zone' ? `inside the zone "${target.name}"` : `within ${fmt(target.within, 0)} mm of (${fmt(target.at.x, 0)}, ${fmt(target.at.y, 0)})`;
        const off = Math.hypot(center.x - seg.end.x, center.y - seg.end.y);
        const predictedOff = off > DIFFERS_MM
          ? ` the robot is predicted to end ${fmt(off, 0)} mm from the planned pose (motor lag and the control loop: see the dotted predicted path), and`
          : '';
        report(mm.stmt.range, 'warning', 'miss',
          `Only ${fmt(seg.hitProbability * 100, 0)} % of runs end ${where} (${fmt(level * 100, 0)} % wanted): the planned pose meets the mark, but${predictedOff} where the robot really ends spreads over an oval of ${fmt(seg.spread.ellipse95.a, 0)} × ${fmt(seg.spread.ellipse95.b, 0)} mm (19 runs in 20). Most of it comes from ${SOURCE_WORDS[top](setup.noise, lastReset ? lastReset.line + 1 : undefined)}.`,
          { at: { x: center.x, y: center.y } });
      }
    }

    function stmtOf(seg: Segment): TurnStmt | DriveStmt | SquareStmt | WaitStmt | undefined {
      const s = motionOf.get(seg)?.stmt;
      return s && (s.kind === 'turn' || s.kind === 'drive' || s.kind === 'square' || s.kind === 'wait') ? s : undefined;
    }

    function simStop(seg: Segment): number | undefined {
      const m = motionOf.get(seg) as Extract<EvaluatedMotion, { stmt: TurnStmt }> | undefined;
      return m?.stop;
    }

    function currentTurnSettings(seg: Segment): { min: number; gain: number; power: number } {
      const m = motionOf.get(seg) as Extract<EvaluatedMotion, { stmt: TurnStmt }>;
      return { min: m.min ?? MOTION_DEFAULTS.turnMin, gain: m.gain ?? MOTION_DEFAULTS.turnGain, power: m.speed ?? MOTION_DEFAULTS.turnPower };
    }

    function solveDrive(dm: Extract<EvaluatedMotion, { stmt: DriveStmt }>, from: Pose): Pose {
      const s = dm.stmt;
      const dist = dm.distance ?? 0;
      const yawStart = reading(from);
      let start = from;
      const path: PathPiece[] = [];
      let yawTarget: number | undefined;
      let turned = 0;
      /** A `hold ... step` that changes the heading: its curve comes from the controller simulation. */
      let stepFrom: { meant: number; jump: number } | undefined;
      if (s.hold && dm.hold !== undefined) {
        yawTarget = dm.hold;
        const holdRange = s.optionRanges.hold ?? s.range;
        const meant = yaw.reading(from.heading);
        const jump = yaw.absoluteChange(dm.hold, from.heading); // the change of heading the hold asks for
        checkTarget(dm.hold, jump, holdRange, s, 'hold', from);
        if (Math.abs(jump) > MOTION_DEFAULTS.headingJump) {
          // With or without `step` the code steers the same way: the path is the hold's curve.
          stepFrom = { meant, jump };
          if (!s.step) {
            report(holdRange, 'warning', 'heading-jump',
              `The drive starts with a sudden ${fmt(Math.abs(jump))}° swerve ${sideOf(jump)}: it holds the yaw reading at ${fmt(dm.hold)}°, but the reading is ${fmt(meant)}° when it starts. Add \`step\` if the change of heading is meant, or turn onto ${fmt(dm.hold)}° first.`);
          }
          turned = jump;
          const turnedPose = rotatePose(from, from, jump, turns);
          path.push({ type: 'rotate', from, to: turnedPose, center: { x: from.x, y: from.y }, turned: jump });
          start = turnedPose;
        }
      }
      const f = forwardVector(start.heading, turns);
      const end: Pose = { x: start.x + f.x * dist, y: start.y + f.y * dist, heading: start.heading };
      path.push({ type: 'line', from: start, to: end });
      const seg = baseSegment(s.line, 'drive', from, end, yawStart, reading(end));
      seg.turned = turned;
      seg.path = path;
      seg.distance = Math.abs(dist);
      if (yawTarget !== undefined) { seg.yawTarget = yawTarget; seg.sensing = 'gyro'; } else seg.sensing = 'encoders';
      seg.complete = dm.distance !== undefined && (!s.hold || dm.hold !== undefined);
      const vMax = fullSpeed();
      if (needWheel(s.keywordRange) && vMax !== undefined) {
        const wd = wheelDegrees(dist)!;
        seg.wheelDeg = { left: wd, right: wd };
        seg.motorDeg = { left: wd * robot.gear!, right: wd * robot.gear! };
        let v: number;
        if (dm.speed === undefined) v = MOTION_DEFAULTS.drivePower * vMax;
        else if (dm.speedIsLinear) {
          v = dm.speed;
          if (v <= 0) report(s.optionRanges.speed ?? s.range, 'error', 'setup', `a speed of ${fmt(v)} mm/s would not move the robot${v < 0 ? ' (to drive backwards, make the distance negative)' : ''}: use a speed above 0, e.g. \`speed 300 mm/s\`.`);
          if (v > vMax) report(s.optionRanges.speed ?? s.range, 'error', 'setup', `${fmt(v)} mm/s is faster than the wheels can go at full power (${fmt(vMax)} mm/s with these motors, gear and wheels); lower the speed.`);
        } else {
          v = dm.speed * vMax;
          checkPower(dm.speed, s.optionRanges.speed ?? s.range, 'speed');
        }
        if (dm.ramp !== undefined && dm.ramp <= 0) report(s.optionRanges.ramp ?? s.range, 'error', 'setup', 'a ramp is an acceleration and must be greater than zero, e.g. `ramp 800 mm/s^2`.');
        seg.power = v / vMax;
        seg.wheelSpeed = v;
        seg.duration = v > 0 ? profileTime(dist, Math.min(v, vMax), dm.ramp) : dist === 0 ? 0 : Infinity;
        if (v > 0 && !Number.isFinite(seg.duration)) report(s.keywordRange, 'error', 'setup', 'The time of this drive cannot be computed (it would take for ever): check the speed, the ramp, the motor and the wheel.');
        if (turned !== 0) seg.duration += Math.abs(turned) * RAD * ((robot.track ?? 0) / 2) / Math.max(v, 1e-9);
      } else seg.complete = false;
      if (s.gain && dm.gain !== undefined && dm.gain <= 0) report(s.optionRanges.gain ?? s.range, 'error', 'setup', 'the gain must be greater than zero.');
      let finalPose = end;
      if (stepFrom && dm.hold !== undefined) {
        const curve = vMax !== undefined && seg.power !== undefined && seg.power > 0 && (dm.gain ?? MOTION_DEFAULTS.driveGain) > 0
          ? stepCurve(from, stepFrom.meant, stepFrom.meant + stepFrom.jump, dist, seg.power, vMax, dm.gain ?? MOTION_DEFAULTS.driveGain, dm.ramp)
          : undefined;
        if (curve) {
          seg.asked = stepFrom.jump;
          seg.path = curve.path;
          seg.end = finalPose = curve.end;
          seg.turned = curve.end.heading - from.heading;
          seg.yawEnd = reading(curve.end);
          seg.duration = curve.duration;
        } else {
          report(s.optionRanges.hold ?? s.range, 'information', 'approximate',
            'The curved path of this `hold ... step` drive needs the wheel, the track and a speed above zero; until they are known it is drawn as a turn in place followed by the straight drive.');
        }
      }
      segments.push(seg);
      // A drive whose length could not be read has no path to check.
      if (dm.distance !== undefined) sweep(seg, s.range, 'drive');
      return finalPose;
    }

    /**
     * The planned curve of a `hold ... step` drive: the heading hold simulated
     * on an ideal robot (no lag, no stall, no delay, an exact sensor), from
     * the reading the plan means to the one it asks for (spec section 8).
     */
    function stepCurve(from: Pose, meant: number, hold: number, dist: number, power: number, vMax: number, gain: number, ramp: number | undefined):
      { path: PathPiece[]; end: Pose; duration: number } | undefined {
      const track = robot.effectiveTrack ?? robot.track;
      if (track === undefined || robot.wheelDiameter === undefined || dist === 0) return undefined;
      // Both readings inside the ideal sensor's range (a change of heading of up to 315°).
      const ideal = simRobot({
        fullSpeed: vMax, lag: 0, stall: 0, mismatch: 1, track, sample: setup.gyro.sample, delay: 0, scale: 1, turns,
        yawLo: Math.min(meant, hold) - 45, circumference: Math.PI * robot.wheelDiameter, gear: robot.gear ?? 1,
      });
      const state = restState(from.x, from.y, from.heading);
      state.zero = from.heading - meant;
      const poses = new PoseBuffer(true);
      poses.pose(0, from.x, from.y, from.heading);
      const out = simulateMotion(state, ideal, { kind: 'hold', target: hold, gain: gain / 100, distance: dist, power, ...(ramp !== undefined && ramp > 0 ? { accel: ramp } : {}) }, undefined, poses);
      poses.close();
      if (!out.finished) return undefined;
      const path = simplify(poses, 0, poses.length - 1, turns);
      let end: Pose = { x: state.x, y: state.y, heading: state.h };
      // The hold approaches its heading without ever quite reaching it: the last hundredths of a
      // degree (far below what the sensor tells apart) are drawn as a turn in place onto it, so the
      // plan's later readings stay the round numbers it means.
      const rest = meant + (end.heading - from.heading) - hold;
      if (Math.abs(rest) < HOLD_SNAP_DEG && rest !== 0) {
        const onto = rotatePose(end, end, -rest, turns);
        path.push({ type: 'rotate', from: end, to: onto, center: { x: end.x, y: end.y }, turned: -rest });
        end = onto;
      }
      return { path, end, duration: state.t };
    }

    function solveTurn(tm: Extract<EvaluatedMotion, { stmt: TurnStmt }>, from: Pose): Pose {
      const s = tm.stmt;
      const gyro = s.sensing === 'gyro' || (s.to !== undefined && s.optionRanges.by === undefined);
      const gyroReferenced = gyro || s.to !== undefined;
      if (s.reset) zero(from.heading);
      const yawStart = reading(from);
      const meant = yaw.reading(from.heading);
      let turned: number;
      let target: number | undefined;
      if (s.to !== undefined) {
        target = tm.to;
        turned = tm.to === undefined ? 0 : yaw.absoluteChange(tm.to, from.heading);
      } else {
        turned = tm.angle ?? 0;
        if (gyro) target = meant + turned;
      }
      // The wrap point and the long way round.
      const crossed = target !== undefined && gyro ? checkTarget(target, turned, s.range, s, 'turn', from) : false;
      if (s.to !== undefined && tm.to !== undefined && Math.abs(turned) > 180 && !crossed) {
        const short = shortWay(turned);
        report(s.range, 'warning', 'long-way',
          `The robot turns ${fmt(Math.abs(turned))}° ${sideOf(turned)}, the long way round: the code computes ${fmt(tm.to)}° − ${fmt(meant)}° = ${fmt(turned)}° without wrapping, because the short way (${fmt(Math.abs(short))}° ${sideOf(short)}) would cross the sensor's wrap point. If the long way is not meant, turn the short way by encoders.`);
      }
      if (gyro) {
        checkPower(tm.speed, s.optionRanges.speed ?? s.range, 'speed');
        if (tm.min !== undefined && tm.min < 0) report(s.optionRanges.min ?? s.range, 'error', 'setup', 'the minimum power cannot be negative.');
        if (tm.min !== undefined && tm.min > 1) report(s.optionRanges.min ?? s.range, 'error', 'setup', `a minimum power of ${fmt(tm.min * 100)} % is more than full power; the motors top out at 100 %.`);
        if (tm.gain !== undefined && tm.gain <= 0) report(s.optionRanges.gain ?? s.range, 'error', 'setup', `a gain of ${fmt(tm.gain)} would ${tm.gain < 0 ? 'turn the robot away from its target' : 'never turn the robot'}: the gain is the % power per degree of error and must be above 0, e.g. \`gain 1\`.`);
      }
      if (tm.speed !== undefined && !gyro) checkPower(tm.speed, s.optionRanges.speed ?? s.range, 'speed');
      const top = tm.speed ?? MOTION_DEFAULTS.turnPower;
      const min = tm.min ?? MOTION_DEFAULTS.turnMin;
      if (min > top) report(s.optionRanges.min ?? s.range, 'error', 'setup', `the minimum power ${fmt(min * 100)} % is above the top power ${fmt(top * 100)} %: the controller could never slow down. Lower \`min\` or raise \`speed\`.`);
      if (tm.stop !== undefined && tm.stop <= 0) report(s.optionRanges.stop ?? s.range, 'error', 'setup', 'the stop band must be greater than zero, e.g. `stop 1 deg`: the reading never equals the target exactly.');
      else if (gyro && tm.stop !== undefined && Math.abs(turned) > 0 && tm.stop >= Math.abs(turned)) {
        report(s.optionRanges.stop ?? s.range, 'error', 'setup', `The robot would not turn at all: it stops once the reading is within ${fmt(tm.stop)}° of the target, and it starts ${fmt(Math.abs(turned))}° away. Use a stop band of a degree or two, e.g. \`stop 1 deg\`.`);
      }

      // Shape: the centre of rotation's offset to the robot's right (robot frame).
      const W = robot.track;
      const sign = turned >= 0 ? 1 : -1; // +1: turning in the file's positive direction
      const cwSign = sign * (turns === 'clockwise' ? 1 : -1); // +1: turning clockwise on the field
      let offset = 0; // lateral offset of the centre, + to the right
      let shape: TurnShape = 'spin';
      let complete = true;
      const shapeNode = s.shape;
      if (shapeNode.kind !== 'spin' && !needTrack(s.keywordRange)) complete = false;
      const half = (W ?? 0) / 2;
      if (shapeNode.kind === 'pivot') {
        shape = shapeNode.side === 'left' ? 'pivot left' : 'pivot right';
        offset = shapeNode.side === 'left' ? -half : half;
      } else if (shapeNode.kind === 'arc' || shapeNode.kind === 'ratio') {
        shape = 'arc';
        let R = tm.radius;
        if (shapeNode.kind === 'ratio' && tm.ratio !== undefined) {
          if (tm.ratio < -1 || tm.ratio >= 1) {
            report(s.optionRanges.ratio ?? s.range, 'error', 'setup', 'a wheel ratio lies from -100 % (a spin) up to, but not including, 100 % (straight); e.g. `ratio 50%`.');
            R = undefined;
          } else R = (((robot.effectiveTrack ?? W ?? 0) / 2) * (1 + tm.ratio)) / (1 - tm.ratio);
        }
        if (R !== undefined && R < 0) {
          report(s.optionRanges.arc ?? s.range, 'error', 'setup', 'an arc radius cannot be negative; use `reverse` to drive the arc backwards, or turn the other way.');
          R = undefined;
        }
        if (R === undefined) complete = false;
        // Forwards, the centre lies on the side the robot turns to; `reverse` swaps it.
        offset = (R ?? 0) * cwSign * (s.reverse ? -1 : 1);
      }
      if (s.reverse && shapeNode.kind !== 'arc' && shapeNode.kind !== 'ratio') {
        report(s.optionRanges.reverse ?? s.range, 'error', 'syntax', '`reverse` goes with `arc` or `ratio` (a spin or pivot has no direction of travel).');
      }
      const r = rightVector(from.heading, turns);
      const center = { x: from.x + r.x * offset, y: from.y + r.y * offset };
      const end = rotatePose(from, center, turned, turns);
      const seg = baseSegment(s.line, 'turn', from, end, yawStart, reading(end));
      seg.shape = shape;
      seg.sensing = gyro ? 'gyro' : 'encoders';
      if (s.reset) seg.zeroesYaw = true;
      seg.turned = turned;
      seg.radius = Math.abs(offset);
      seg.center = center;
      seg.path = turned === 0 ? [] : [{ type: 'rotate', from, to: end, center, turned }];
      seg.distance = Math.abs(turned * RAD * offset);
      if (gyroReferenced && target !== undefined) seg.yawTarget = target;
      seg.complete = complete && (s.to !== undefined ? tm.to !== undefined : tm.angle !== undefined);
      // Wheel travel: clockwise rotation φ about a centre at lateral offset c
      // moves a wheel at lateral position w forwards by φ (c − w).
      const phi = turned * (turns === 'clockwise' ? 1 : -1) * RAD;
      const vMax = fullSpeed();
      if (needWheel(s.keywordRange) && vMax !== undefined && (W !== undefined || shapeNode.kind === 'spin') && W !== undefined) {
        const t = wheelTravel(phi, W, offset);
        seg.wheelDeg = { left: wheelDegrees(t.left)!, right: wheelDegrees(t.right)! };
        // Encoder targets use the calibrated track: the robot turns as if its
        // wheels were that far apart. A pivot keeps its still wheel still (its
        // centre scales with the calibrated track); an arc's radius is the
        // user's own, and a wheel ratio's radius already comes from the
        // calibrated track, so the commanded degrees drive the drawn path.
        const effective = robot.effectiveTrack ?? W;
        const te = gyro ? t : wheelTravel(phi, effective, shapeNode.kind === 'pivot' ? (offset * effective) / W : offset);
        seg.motorDeg = { left: wheelDegrees(te.left)! * robot.gear!, right: wheelDegrees(te.right)! * robot.gear! };
        const outerRadius = Math.abs(offset) + half;
        seg.power = top;
        seg.wheelSpeed = top * vMax;
        if (gyro || s.ramp) seg.minPower = min;
        if (gyro) {
          seg.duration = gyroTurnTime({
            angle: Math.abs(turned), ratePerPower: outerRadius > 0 ? (vMax / outerRadius) / RAD : Infinity,
            gain: (tm.gain ?? MOTION_DEFAULTS.turnGain) / 100, top, min, stop: tm.stop ?? MOTION_DEFAULTS.turnStop,
            lag: robot.motorLag ?? 0,
          });
        } else {
          // The wheels must turn the commanded (calibrated-track) travel.
          const outerCommanded = Math.max(Math.abs(te.left), Math.abs(te.right));
          seg.duration = encoderTurnTime(outerCommanded, top * vMax, Math.max(min, 1e-3) * vMax, s.ramp);
        }
        if (!Number.isFinite(seg.duration)) report(s.keywordRange, 'error', 'setup', 'The time of this turn cannot be computed (it would take for ever): check the speeds, the motor and the wheel.');
      } else {
        if (W === undefined) needTrack(s.keywordRange);
        seg.complete = false;
      }
      segments.push(seg);
      if (s.to !== undefined ? tm.to !== undefined : tm.angle !== undefined) sweep(seg, s.range, shape);
      return end;
    }

    function solveSquare(qm: Extract<EvaluatedMotion, { stmt: SquareStmt }>, from: Pose): Pose {
      const s = qm.stmt;
      const yawStart = reading(from);
      const out = squareUp(from, s.side, footprint, turns, walls);
      const ahead = s.side === 'front' ? 'forwards' : 'backwards';
      if (!out) {
        report(s.range, 'error', 'no-wall', `Driving ${ahead} from here the robot meets no wall (no field edge or box side ahead), so it would drive on until stopped. Turn to face a wall first${setup.field ? '' : ', or declare the `field`'}.`);
        const seg = baseSegment(s.line, 'square', from, from, yawStart, yawStart);
        seg.complete = false;
        segments.push(seg);
        return from;
      }
      const wallName = out.wall.obstacle ? `"${out.wall.obstacle.name}"` : out.wall.label;
      let end = out.end;
      if (out.outcome === 'side') {
        // A side of the footprint catches a corner first: the robot stops there, unsquared.
        report(s.range, 'error', 'no-wall', `After ${fmt(out.travel, 0)} mm the side of the robot catches the corner of ${wallName} before its ${s.side} edge meets a wall: it will twist or stall instead of squaring up. Turn so the ${s.side} faces the wall, or start further from the corner.`, { at: out.contact });
        end = out.atContact;
      } else if (out.outcome === 'slips') {
        report(s.range, 'error', 'no-wall', `The ${s.side} edge meets only the corner of ${wallName}: squared up there, the robot would not rest against it and would slip past. Line up with the wall so the ${s.side} edge meets its flat side.`, { at: out.contact });
      } else if (out.offSquare > 30) {
        report(s.range, 'error', 'no-wall', `The robot meets ${out.wall.label} ${fmt(out.offSquare, 0)}° off square (more than 30°): it will slide along it or twist instead of squaring up. Turn to face the wall more squarely first.`, { at: out.contact });
      }
      const turned = end.heading - from.heading;
      const seg = baseSegment(s.line, 'square', from, end, yawStart, wrapReading(yawStart + turned, lo));
      seg.turned = turned;
      seg.distance = out.travel;
      // The drive along the heading to the first contact, then the turn onto the wall there.
      seg.path = [{ type: 'line', from, to: out.atContact }];
      if (end !== out.atContact) seg.path.push(rigidPiece(out.atContact, end, turns));
      const vMax = fullSpeed();
      if (needWheel(s.keywordRange) && vMax !== undefined) {
        checkPower(qm.speed, s.optionRanges.speed ?? s.range, 'speed');
        const v = (qm.speed ?? MOTION_DEFAULTS.squarePower) * vMax;
        seg.power = qm.speed ?? MOTION_DEFAULTS.squarePower;
        seg.wheelSpeed = v;
        seg.duration = v > 0 ? out.travel / v : 0;
        const wd = wheelDegrees(out.travel * (s.side === 'front' ? 1 : -1))!;
        seg.wheelDeg = { left: wd, right: wd };
        seg.motorDeg = { left: wd * robot.gear!, right: wd * robot.gear! };
      }
      segments.push(seg);
      // The drive to the wall is checked against everything but the box it
      // meets (it touches it at the end); the turn onto the wall against
      // everything but that wall (it presses against it).
      const wallBox = out.wall.obstacle;
      const others = wallBox ? setup.obstacles.filter((o) => o !== wallBox) : setup.obstacles;
      sweep(seg, s.range, (i) => i === 0
        ? { name: 'the drive to the wall', obstacles: others, field: setup.field }
        : { name: 'the turn onto the wall', obstacles: others, field: wallBox ? setup.field : undefined });
      if (out.wall.obstacle) squareWall.set(seg, out.wall.obstacle);
      if (out.outcome !== 'side') {
        const away = out.wall.normal;
        squaredAgainst = { obstacle: out.wall.obstacle, away: out.wall.axis === 'x' ? { x: away, y: 0 } : { x: 0, y: away } };
      }
      return end;
    }

    function checkMark(mm: Extract<EvaluatedMotion, { stmt: MarkStmt }>, p: Pose) {
      const s = mm.stmt;
      if (mm.level !== undefined && s.level && !(mm.level >= 0.5 && mm.level < 1)) {
        report(s.level.range, 'error', 'setup', mm.level >= 1
          ? `a level of ${fmt(mm.level * 100, 1)} % can never be met: some runs always spread wider. It is the share of runs that must meet the mark; 95 % is usual, e.g. \`level 95%\`.`
          : `a level of ${fmt(mm.level * 100, 1)} % asks for a mark that most runs miss: it is the share of runs that must meet the mark, from 50 % up (95 % is usual), e.g. \`level 90%\`.`);
      }
      if (mm.within !== undefined && mm.within <= 0) report(s.optionRanges.within ?? s.range, 'error', 'setup', `a mark allows a miss of more than 0 mm: \`within ${fmt(mm.within)}\` could never be met. Use e.g. \`within 20 mm\`.`);
      const within = mm.within ?? MOTION_DEFAULTS.markWithin;
      if (mm.at) {
        const miss = Math.hypot(p.x - mm.at.x, p.y - mm.at.y);
        if (miss > within) {
          report(s.optionRanges.at ?? s.range, 'warning', 'miss',
            `the planned position (${fmt(p.x, 0)}, ${fmt(p.y, 0)}) is ${fmt(miss, 0)} mm from "${s.name.value}" at (${fmt(mm.at.x, 0)}, ${fmt(mm.at.y, 0)}), more than the ${fmt(within, 0)} mm allowed: adjust the drives before this mark.`,
            { at: { x: mm.at.x, y: mm.at.y } });
        }
      }
      if (mm.heading !== undefined) {
        const diff = ((((p.heading - mm.heading) % 360) + 540) % 360) - 180;
        if (Math.abs(diff) > MOTION_DEFAULTS.markHeadingWithin) {
          report(s.optionRanges.heading ?? s.range, 'warning', 'miss',
            `the planned heading ${fmt(normal(p.heading))}° is ${fmt(Math.abs(diff))}° off the ${fmt(mm.heading)}° wanted at "${s.name.value}" (allowed: ${MOTION_DEFAULTS.markHeadingWithin}°).`,
            { at: { x: p.x, y: p.y } });
        }
      }
      if (s.inZone) {
        const zone = setup.zones.find((z) => z.name === s.inZone!.value);
        if (!zone) {
          const guess = setup.zones.map((z) => z.name).find((n) => n.toLowerCase() === s.inZone!.value.toLowerCase());
          report(s.inZone.range, 'error', 'name', `there is no zone named "${s.inZone.value}"${guess ? `: did you mean "${guess}"?` : '; declare it with `zone "NAME" (X1, Y1) to (X2, Y2)`.'}`);
        } else if (p.x < zone.min.x || p.x > zone.max.x || p.y < zone.min.y || p.y > zone.max.y) {
          const dx = Math.max(zone.min.x - p.x, 0, p.x - zone.max.x);
          const dy = Math.max(zone.min.y - p.y, 0, p.y - zone.max.y);
          report(s.inZone.range, 'warning', 'miss',
            `The robot ends ${fmt(Math.hypot(dx, dy), 0)} mm outside the zone "${zone.name}": the point midway between its wheels (the axle midpoint) is at (${fmt(p.x, 0)}, ${fmt(p.y, 0)}). Adjust the drives before this mark.`,
            { at: { x: p.x, y: p.y } });
        }
      }
    }

    /**
     * A gyro target outside the sensor's range, or within the noise band of
     * the wrap point; `change` is the change of heading the motion means.
     * Returns whether the target crosses the wrap point.
     */
    function checkTarget(target: number, change: number, range: Range, stmt: TurnStmt | DriveStmt, what: 'turn' | 'hold', where: Pose): boolean {
      const at = { x: where.x, y: where.y };
      const h = where.heading;
      const fixedTarget = fixedYaw.reading(h) + change;
      if (!yaw.inRange(target)) {
        yaw.gyroMotion(target, h);
        if (root && fixedYaw.inRange(fixedTarget)) {
          // Follows from the earlier crossing: once that one is fixed, this target lies in range.
          (root.related ??= []).push({ range, message: `Line ${stmt.line + 1} (${describeTarget(stmt, target)}) follows from this crossing: once it is fixed, that target is ${fmt(fixedTarget)}°, inside the range.` });
          return true;
        }
        wrapCrossings++;
        const wrapAt = target >= hi ? hi : lo;
        const afterZero = yaw.zeroReading + change;
        const resetHelps = yaw.inRange(afterZero);
        // The fixed run: a zero here where one helps; otherwise the turn's fix
        // (by encoders) leaves the sensor's own reading.
        if (resetHelps) fixedYaw.zero(h);
        const consequence = what === 'turn' ? 'the robot spins on and never settles' : 'the robot swerves round in circles';
        const advice = resetHelps
          ? (stmt.kind === 'turn' && stmt.angle
            ? 'Zero the yaw just before it (add `reset` to the turn): the target then lies inside the range.'
            : `Reset the yaw before this line and aim for ${fmt(afterZero)}° instead: the robot then does the same.`)
          : `No reset helps: ${fmt(Math.abs(change))}° ${sideOf(change)} from zero already leaves the range. ${what === 'turn' ? 'Turn by encoders instead (the yaw sensor is then not used), or split the turn into smaller gyro turns.' : 'Turn onto the new heading first, then zero the yaw and hold that.'}`;
        root = report(range, 'error', 'wrap-cross',
          `The robot never settles here: the yaw target ${fmt(target)}° lies outside the sensor's range (${fmt(lo)}° to ${fmt(hi)}°), so as the robot passes ${fmt(wrapAt)}° the reading jumps by 360°, the error grows instead of shrinking and ${consequence}. ${advice}`,
          { at });
        return true;
      }
      yaw.gyroMotion(target, h);
      if (yaw.nearWrapPoint(target, MOTION_DEFAULTS.wrapEdge)) {
        report(range, 'warning', 'wrap-edge',
          `The yaw target ${fmt(target)}° is within ${MOTION_DEFAULTS.wrapEdge}° of the sensor's wrap point (${fmt(target - lo <= MOTION_DEFAULTS.wrapEdge ? lo : hi)}°): sensor noise can flip the reading between ${fmt(lo)}° and ${fmt(hi)}° and the robot can spin or swerve. Reset the yaw before this line so the target sits mid-range.`,
          { at });
      }
      return false;
    }

    function sideOf(change: number): string {
      const clockwise = (change >= 0) === (turns === 'clockwise');
      return clockwise ? 'to the right' : 'to the left';
    }

    function checkPower(p: number | undefined, range: Range, what: string) {
      if (p === undefined) return;
      if (p > 1) report(range, 'error', 'setup', `a ${what} of ${fmt(p * 100)} % is more than full power; the motors top out at 100 %.`);
      else if (p <= 0) report(range, 'error', 'setup', `a ${what} of ${fmt(p * 100)} % would not move the robot; use a power above 0 %.`);
    }

    /**
     * Sweeps each piece of a segment's path against what `checkOf(i)` names
     * (a plain name: every obstacle and the field edge, a hit described by that
     * name), reporting each obstacle (and the field) once. A move that leaves the
     * wall just squared against only touches it at the start: lifted off by a
     * hair, does it still hit?
     */
    function sweep(seg: Segment, range: Range, checkOf: string | ((piece: number) => PieceCheck)) {
      let seen: Set<string> | undefined;
      const leaving = squaredAgainst;
      squaredAgainst = undefined;
      const path = seg.path;
      for (let i = 0; i < path.length; i++) {
        const piece = path[i];
        const check = typeof checkOf === 'string' ? everything(checkOf) : checkOf(i);
        for (const hit of sweepPiece(piece, footprint, turns, check.obstacles, check.field)) {
          if (leaving?.obstacle && hit.obstacle === leaving.obstacle &&
            sweepPiece(shiftPiece(piece, leaving.away, CONTACT_CLEARANCE), footprint, turns, [hit.obstacle], undefined).length === 0) continue;
          const key = hit.kind === 'field' ? 'field' : `o:${hit.obstacle?.name}`;
          seen ??= new Set<string>();
          if (seen.has(key)) continue;
          seen.add(key);
          reportHit(hit, range, check.name, seg, piece);
        }
      }
    }

    /** Every obstacle and the field edge, for a drive or a turn (each piece of a motion named `name`). */
    function everything(name: string): PieceCheck {
      return { name, obstacles: setup.obstacles, field: setup.field };
    }

    function reportHit(hit: SweepHit, range: Range, shapeName: string, seg: Segment, piece?: PathPiece) {
      const what = describeShape(shapeName);
      if (hit.kind === 'field') {
        report(range, 'error', 'off-field', `during ${what} part of the robot leaves the field near (${fmt(hit.at.x, 0)}, ${fmt(hit.at.y, 0)}): it would fall off or hit the border. Shorten the move or start further in.`, { at: hit.at });
        return;
      }
      const o = hit.obstacle!;
      let hint = '';
      if (piece?.type === 'rotate' && (seg.shape === 'pivot left' || seg.shape === 'pivot right' || seg.shape === 'arc')) {
        // A spin sweeps less: say so when it clears the obstacle.
        const spin: PathPiece = { type: 'rotate', from: piece.from, to: rotatePose(piece.from, piece.from, piece.turned, turns), center: { x: piece.from.x, y: piece.from.y }, turned: piece.turned };
        const spinHits = sweepPiece(spin, footprint, turns, [o], undefined);
        if (spinHits.length === 0) hint = ' A spin turn here clears it (the robot would then end at a different position).';
      }
      report(range, 'error', 'collision',
        `the robot's footprint hits the ${o.kind} "${o.name}" during ${what}.${hint || (piece?.type === 'rotate' && seg.kind === 'turn' ? (seg.shape === 'spin' ? ' Turn further from it: change the drives before this line.' : ' A spin turn here hits it too: turn further from it.') : ' Move the path away from it: change the drives before this line.')}`,
        { at: hit.at, ...(hit.pose ? { pose: hit.pose } : {}), related: [{ range: { start: { line: o.line, character: 0 }, end: { line: o.line, character: 0 } }, message: `"${o.name}" is declared here` }] });
    }
  }
  return results;
}

type Obstacle = PlanSetup['obstacles'][number];

/** What one piece of a path is checked against, and how a hit during it is described. */
interface PieceCheck {
  name: string;
  obstacles: readonly Obstacle[];
  field?: PlanSetup['field'];
}

/** A mark is met in at least this share of runs, or `miss` says how often it is. */
const MARK_LEVEL = 0.95;

/** What each source of spread is, and what helps, in a miss's message. */
const SOURCE_WORDS: Record<SpreadSource, (n: PlanSetup['noise'], resetLine?: number) => string> = {
  drive: (n) => `the distance error of encoder drives (±${fmt(n.drive * 100)} %, \`noise drive\`): square on a wall shortly before the mark, or measure the wheel more exactly`,
  turn: (n) => `the angle error of encoder turns (±${fmt(n.turn * 100)} %, \`noise turn\`): turn by gyro instead, or calibrate the effective track`,
  gyro: (n) => `the gyro's error at the end of each gyro motion (${fmt(n.gyro)}°, \`noise gyro\`): square on a wall shortly before the mark`,
  drift: (_n, line) => `the gyro's drift since ${line ? `the reset on line ${line}` : 'the start'}: reset the yaw just after squaring on a wall`,
  wheel: () => 'the wheels\' random slip over the distance driven: square on a wall shortly before the mark',
};

/** A `hold ... step` curve ending this close to its heading (degrees) is taken to end on it. */
const HOLD_SNAP_DEG = 0.1;

/** Margin (mm) around the sampled positions of a predicted motion for the quick test. */
const BOUNDS_SLACK = 5;

/** Whether an obstacle reaches into the box from (minX, minY) to (maxX, maxY). */
function nearBox(o: Obstacle, minX: number, minY: number, maxX: number, maxY: number): boolean {
  if (o.kind === 'circle' && o.center && o.radius !== undefined) {
    return o.center.x + o.radius >= minX && o.center.x - o.radius <= maxX && o.center.y + o.radius >= minY && o.center.y - o.radius <= maxY;
  }
  if (o.min && o.max) return o.max.x >= minX && o.min.x <= maxX && o.max.y >= minY && o.min.y <= maxY;
  return true;
}

/** Fixes worked out on first use (the editor asks for those of the lines in view; `veer fix` and SARIF for all). */
function lazyFixes(d: Diagnostic, make: () => Fix[]): void {
  let made: Fix[] | undefined;
  Object.defineProperty(d, 'fixes', {
    enumerable: true, configurable: true,
    get: () => (made ??= make()),
    set: (v: Fix[] | undefined) => { made = v; },
  });
}

/** How far (mm) a robot flush against a wall is lifted off it to tell touching from pressing in. */
const CONTACT_CLEARANCE = 0.01;

function shiftPiece(piece: PathPiece, dir: Point, d: number): PathPiece {
  const move = <T extends Point>(p: T): T => ({ ...p, x: p.x + dir.x * d, y: p.y + dir.y * d });
  return piece.type === 'line'
    ? { type: 'line', from: move(piece.from), to: move(piece.to) }
    : { type: 'rotate', from: move(piece.from), to: move(piece.to), center: move(piece.center), turned: piece.turned };
}


function describeShape(shape: string): string {
  switch (shape) {
    case 'spin': return 'this spin turn';
    case 'pivot left': return 'this pivot turn (left wheel still)';
    case 'pivot right': return 'this pivot turn (right wheel still)';
    case 'arc': return 'this arc';
    case 'drive': return 'this drive';
    default: return shape;
  }
}

function describeTarget(stmt: TurnStmt | DriveStmt, target: number): string {
  if (stmt.kind === 'drive') return `hold ${fmt(target)}`;
  return stmt.to ? `turn to ${fmt(target)}` : `a gyro turn aiming at ${fmt(target)}°`;
}

function normal(h: number): number {
  return ((h % 360) + 360) % 360;
}

/** Each wheel's travel when the robot turns clockwise by `phi` (radians) about a centre `centre` to its right, the wheels `track` apart. */
function wheelTravel(phi: number, track: number, centre: number): { left: number; right: number } {
  return { left: phi * (centre + track / 2), right: phi * (centre - track / 2) };
}

function baseSegment(line: number, kind: Segment['kind'], start: Pose, end: Pose, yawStart: number, yawEnd: number): Segment {
  return { line, kind, start, end, turned: 0, yawStart, yawEnd, duration: 0, distance: 0, path: [], complete: true };
}

export type { Footprint };
