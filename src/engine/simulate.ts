// Stage two of a forecast: the battery loop for one variant of a prepared trip
// (forecast-engine.md steps 9, 12, 13, "Chargers and battery" and "Revision 2"): charge Q in Ah,
// integrated in sub-steps inside each hour, with loads and MPPT solar as power at the terminal
// volts and chargers and PWM solar as current sources.
import { z } from 'zod';
import { bankResistanceOhms, busCurrentOrNaN, capacityFactor, coldChargeBlocked, dischargeCurrent, isLeadAcid, ocvAtSoc, ocvCurve, ocvTable, peukertFactor, taperedChargeAh, taperKnee, thermalStep } from './battery';
import { generatorRuns, inGeneratorWindow } from './chargers';
import { PlanValidationError, zodIssuesToEnvelope } from './errors';
import { inverterDcWatts } from './loads';
import { BATTERY_SUBSTEPS, darkBelowDeg, SUBSTEPS, type PreparedTrip, type RowWarning } from './prepare';
import { controllerCapWatts } from './pv';
import { bankSchema, chargerSchema, resolveBank, type ResolvedBank, type ResolvedCharger } from './schema';

/** What a sweep may change without preparing the trip again. */
export const variantSchema = z.object({
  /** A whole bank as in the plan (chemistry defaults apply to omitted fields). */
  bank: bankSchema.optional(),
  /** Rated watts per array, in the plan's array order (same length). */
  arrayWatts: z.array(z.number().min(0).max(100_000)).optional(),
  /** Multiplies every array's rated watts (after `arrayWatts`). */
  arrayScale: z.number().min(0).max(100).optional(),
  /** The whole charger list, replacing the plan's. */
  chargers: z.array(chargerSchema).max(20).optional(),
  /** Amps per charger, in the (plan's or variant's) charger order (same length). */
  chargerAmps: z.array(z.number().gt(0).max(1000)).optional(),
  /** Generator window [from, to) applied at every stop without hookup. */
  generatorHours: z.tuple([z.number().int().min(0).max(24), z.number().int().min(0).max(24)]).optional(),
});

/** A plan variant for `simulatePrepared` (input form: defaults may be omitted). */
export type Variant = z.input<typeof variantSchema>;

/** Why the bank disconnected (values of `SimResult.cutoffEvent`): none, its SOC floor, its cutoff volts. */
export const CUTOFF_NONE = 0;
/** The bank reached its SOC floor. */
export const CUTOFF_FLOOR = 1;
/** The bank's terminal volts reached the cutoff (a voltage or surge cutoff, or a voltage collapse). */
export const CUTOFF_VOLTS = 2;

/** Unrounded totals of one simulation. */
export interface SimSummary {
  startSocPct: number;
  minSocPct: number;
  minSocRow: number;
  firstCutoffRow: number | null;
  unmetWh: number;
  solarWh: number;
  curtailedWh: number;
  /** Parts of curtailedWh by cause (see SimResult.curtailedColdW). */
  curtailedColdWh: number;
  curtailedFullWh: number;
  curtailedLimitWh: number;
  chargeWh: number;
  loadWh: number;
  generatorHours: number;
  generatorLitres: number;
  endSocPct: number;
  coldBlockedHours: number;
  /** Revision 2: the trip's lowest terminal volts (rows' `minVolts`) and its row. */
  minVolts: number;
  minVoltsRow: number;
  /** Revision 2: the lowest end-of-hour usable charge, %. */
  minUsablePct: number;
}

/** Raw, unrounded result of one simulation: one entry per row in each array. */
export interface SimResult {
  n: number;
  bank: ResolvedBank;
  chargers: ResolvedCharger[];
  arrayWatts: number[];
  /** True SOC % (100·Q/C) at the hour's start and end. */
  socStartPct: Float64Array;
  socEndPct: Float64Array;
  /** Revision 2: usable charge % at the hour's end, 100·max(0, Q − C·(1 − f(Tb)))/C. */
  usablePct: Float64Array;
  /** Terminal volts at the hour's end with the hour's average net current. */
  volts: Float64Array;
  /** Revision 2: the hour's lowest terminal volts (surges included). */
  minVolts: Float64Array;
  /** Revision 2: the hour's time-averaged terminal volts. */
  avgVolts: Float64Array;
  solarW: Float64Array;
  chargeW: Float64Array;
  loadW: Float64Array;
  unmetW: Float64Array;
  curtailedW: Float64Array;
  /** Why solar was curtailed, parts of `curtailedW`: the cold (a warm bank would have taken it: the
   * LiFePO4 lockout, lead-acid's cold acceptance), the bank nearly full (the taper), and the bank's
   * own charge-current limit (maxChargeAmps, with room left). */
  curtailedColdW: Float64Array;
  curtailedFullW: Float64Array;
  curtailedLimitW: Float64Array;
  /** Ah delivered to the bank's terminals (before charge efficiency). */
  ahIn: Float64Array;
  /** Ah removed from the bank, Peukert-adjusted. */
  ahOut: Float64Array;
  /** Ah drawn at the terminals (current × time, before Peukert). */
  ahOutRaw: Float64Array;
  /** Cold capacity factor f of the hour (the bottom C·(1 − f) Ah cannot be drawn). */
  capacityFactor: Float64Array;
  batteryC: Float64Array;
  /** Revision 2: the cabin's temperature in the hour, °C. */
  cabinC: Float64Array;
  generatorOn: Uint8Array;
  /** 1 when the bank was disconnected for any part of the hour. */
  disconnected: Uint8Array;
  /** 1 when the cold lockout refused charge in the hour. */
  coldBlocked: Uint8Array;
  /** CUTOFF_FLOOR / CUTOFF_VOLTS in the row where the bank disconnects. */
  cutoffEvent: Uint8Array;
  warnings: RowWarning[];
  summary: SimSummary;
}

const EPS = 1e-9;

function resolveVariant(prepared: PreparedTrip, variant: Variant | undefined) {
  const plan = prepared.plan;
  if (variant === undefined) {
    return { bank: plan.bank, chargers: plan.chargers, arrayWatts: plan.arrays.map((a) => a.ratedWatts), generatorHours: null };
  }
  const parsed = variantSchema.safeParse(variant);
  if (!parsed.success) throw new PlanValidationError(zodIssuesToEnvelope(parsed.error.issues, 'The variant is invalid.'));
  const v = parsed.data;
  const issues: { path: string; message: string }[] = [];
  if (v.arrayWatts && v.arrayWatts.length !== plan.arrays.length) issues.push({ path: 'arrayWatts', message: `must list ${plan.arrays.length} arrays` });
  const gens = (v.chargers ?? []).filter((c) => c.kind === 'generator');
  if (gens.length > 1) issues.push({ path: 'chargers', message: 'at most one generator' });
  if (gens.some((g) => !(g.startSocPct < g.stopSocPct))) issues.push({ path: 'chargers', message: 'the generator must start below its stop level' });
  if (v.generatorHours && !(v.generatorHours[0] < v.generatorHours[1])) issues.push({ path: 'generatorHours', message: 'start must be before stop' });
  const chargers = v.chargers ?? plan.chargers;
  if (v.chargerAmps && v.chargerAmps.length !== chargers.length) issues.push({ path: 'chargerAmps', message: `must list ${chargers.length} chargers` });
  if (issues.length > 0) throw new PlanValidationError({ error: { code: 'invalid_plan', message: 'The variant is invalid.' }, issues });
  const scale = v.arrayScale ?? 1;
  const amps = v.chargerAmps;
  return {
    bank: v.bank ? resolveBank(v.bank) : plan.bank,
    chargers: amps ? chargers.map((c, i) => ({ ...c, amps: amps[i] ?? c.amps })) : chargers,
    arrayWatts: (v.arrayWatts ?? plan.arrays.map((a) => a.ratedWatts)).map((w) => w * scale),
    generatorHours: v.generatorHours ?? null,
  };
}

/**
 * Charge Q after `t` hours of a bank offered `want` amps, accepting at most `acc` amps tapering to
 * zero at full above the knee (forecast-engine.md, Revision 2): the free end point when the
 * acceptance still covers `want` there, else the exact tapered charge.
 */
function acceptedQ(q: number, want: number, t: number, acc: number, cap: number, kneeAh: number, knee: number, eta: number): number {
  if (acc <= 0) return q;
  const qFree = q + eta * want * t;
  if (want <= acc * (qFree <= kneeAh ? 1 : (cap - Math.min(qFree, cap)) / (cap - kneeAh))) return Math.min(qFree, cap);
  return Math.min(qFree, taperedChargeAh(q, cap, acc, eta, knee, t), cap);
}

/** Usable charge as a fraction of rated: the charge above what the cold strands (C·(1 − f)). */
function usableOf(cap: number, q: number, f: number): number {
  return Math.max(0, q - cap * (1 - f)) / cap;
}

function fmt(x: number, digits: number): string {
  return (Math.round(x * 10 ** digits) / 10 ** digits).toFixed(digits);
}

/** Runs the battery loop of a prepared trip for one variant (or the plan itself). */
export function simulatePrepared(prepared: PreparedTrip, variant?: Variant): SimResult {
  const { n, grid, plan } = prepared;
  const v = resolveVariant(prepared, variant);
  const bank = v.bank;
  const chem = bank.chemistry;
  const vn = bank.nominalVolts;
  const cap = bank.capacityAh;
  const k = bank.peukertExponent;
  const eta = bank.chargeEfficiencyPct / 100;
  const floor = bank.floorSocPct / 100;
  const maxChargeA = bank.maxChargeAmps;
  const ohms = bankResistanceOhms(bank.internalResistanceMilliohm, cap);
  const knee = taperKnee(chem);
  const kneeAh = knee * cap;
  const lead = isLeadAcid(chem);
  const inCabin = bank.location === 'cabin';
  const cutoffV = bank.cutoffVolts;
  // The end-of-hour volts read the curve against SOC (a plain function the loop inlines).
  const ocvC = ocvCurve(chem, vn);
  // The sub-step loop tracks its OCV segment (charge moves little between sub-steps).
  const ocvT = ocvTable(chem, vn, cap);
  const oQ = ocvT.qs;
  const oV = ocvT.vs;
  const oS = ocvT.slopes;
  const oLast = oS.length - 1;
  let seg = 0;
  const i20 = cap / 20;

  // ---- chargers by kind: current sources at their rated amps (Revision 2) ----
  let alternatorA = 0;
  let shoreA = 0;
  let generator: ResolvedCharger | null = null;
  for (const c of v.chargers) {
    if (c.kind === 'alternator') alternatorA += c.amps;
    else if (c.kind === 'shore') shoreA += c.amps;
    else generator = c;
  }
  const generatorA = generator ? generator.amps : 0;

  // ---- arrays: MPPT as power (capped at its amps × nominal volts), PWM as current ----
  const na = prepared.arrays.length;
  const mpptIdx: number[] = [];
  const pwmIdx: number[] = [];
  const arrMul = new Float64Array(na);
  const arrCap = new Float64Array(na);
  for (let a = 0; a < na; a++) {
    const pa = prepared.arrays[a]!;
    const rated = v.arrayWatts[a] ?? 0;
    if (!(rated > 0)) continue;
    if (pa.spec.controller === 'mppt') {
      mpptIdx.push(a);
      arrMul[a] = rated * (pa.spec.controllerEfficiencyPct / 100);
      arrCap[a] = controllerCapWatts(pa.spec, vn);
    } else {
      pwmIdx.push(a);
      const vmp = pa.spec.vmpVolts ?? 18 * Math.max(1, Math.round(vn / 12));
      arrMul[a] = rated / vmp;
      arrCap[a] = pa.spec.controllerMaxAmps ?? Infinity;
    }
  }

  const nMppt = mpptIdx.length;
  const nPwm = pwmIdx.length;
  const perWattSubs = prepared.arrays.map((pa) => pa.perWattSub);
  // Hours whose midpoint sun is this far down have no sun in any sub-step (see prepare.ts).
  const darkDeg = plan.stops.map((st) => darkBelowDeg(st.lat));

  const socStartPct = new Float64Array(n);
  const socEndPct = new Float64Array(n);
  const usablePctA = new Float64Array(n);
  const volts = new Float64Array(n);
  const minVoltsA = new Float64Array(n);
  const avgVoltsA = new Float64Array(n);
  const solarW = new Float64Array(n);
  const chargeW = new Float64Array(n);
  const loadW = new Float64Array(n);
  const unmetW = new Float64Array(n);
  const curtailedW = new Float64Array(n);
  const curtailedColdW = new Float64Array(n);
  const curtailedFullW = new Float64Array(n);
  const curtailedLimitW = new Float64Array(n);
  const ahIn = new Float64Array(n);
  const ahOut = new Float64Array(n);
  const ahOutRaw = new Float64Array(n);
  const capF = new Float64Array(n);
  const batteryC = new Float64Array(n);
  const cabinC = new Float64Array(n);
  const generatorOn = new Uint8Array(n);
  const disconnected = new Uint8Array(n);
  const coldBlocked = new Uint8Array(n);
  const cutoffEvent = new Uint8Array(n);
  const warnings: RowWarning[] = [];


  let q = (bank.initialSocPct / 100) * cap;
  // The battery starts at its surroundings (Revision 2). A bank in the cabin is in a heated cabin
  // when the bank can power the heating (or shore power does).
  const amb0 = n > 0 ? prepared.ambientC[0]! : 20;
  const heated0 = n > 0 ? prepared.cabinHeatedC[0]! : amb0;
  const givenTb = bank.initialBatteryC;
  let tb = givenTb ?? (inCabin ? heated0 : amb0);
  let disc = usableOf(cap, q, capacityFactor(chem, tb)) <= floor + EPS;
  if (givenTb === undefined && disc && inCabin && !(n > 0 && prepared.shore[0] === 1)) {
    tb = amb0;
    disc = usableOf(cap, q, capacityFactor(chem, tb)) <= floor + EPS;
  }
  const startedDisconnected = disc;
  let reason = disc ? CUTOFF_FLOOR : CUTOFF_NONE;
  let usableAtVoltCut = 0;
  let reconnectRow = 0;
  let firstCutoffRow: number | null = null;
  if (disc) {
    firstCutoffRow = 0;
    cutoffEvent[0] = CUTOFF_FLOOR;
    warnings.push({ code: 'floor-cutoff', row: 0, message: `The bank starts with ${fmt(usableOf(cap, q, capacityFactor(chem, tb)) * 100, 1)} % usable charge, at or below its ${fmt(bank.floorSocPct, 1)} % floor, so it starts disconnected; loads go unmet until charging lifts it to ${fmt(bank.floorSocPct + 5, 1)} %.` });
  }
  let genRunning = false;
  let genHours = 0;
  let coldHours = 0;
  let minSoc = Infinity;
  let minRow = 0;
  let minV = Infinity;
  let minVRow = 0;
  let minUsable = Infinity;
  let unmetWh = 0;
  let solarWh = 0;
  let curtailedWh = 0;
  let curtailedColdWh = 0;
  let curtailedFullWh = 0;
  let curtailedLimitWh = 0;
  let chargeWh = 0;
  let loadWh = 0;

  const M = BATTERY_SUBSTEPS;
  const dt = 1 / M;
  const solarPerBattery = SUBSTEPS / M;

  for (let r = 0; r < n; r++) {
    const ta = prepared.ambientC[r]!;
    const f = capacityFactor(chem, tb);
    const qStranded = cap * (1 - f);
    // ---- reconnect at the hour's start (on usable charge, Revision 2) ----
    if (disc) {
      const u = usableOf(cap, q, f);
      if (reason === CUTOFF_FLOOR && u >= floor + 0.05 - EPS) disc = false;
      else if (reason === CUTOFF_VOLTS && r >= reconnectRow && u >= Math.max(floor, usableAtVoltCut) + 0.05 - EPS) disc = false;
      if (!disc) reason = CUTOFF_NONE;
    }

    // ---- generator, decided at the hour's start on true SOC ----
    let genAllowed = false;
    if (generator) {
      genAllowed = v.generatorHours
        ? prepared.generatorSite[r] === 1 && inGeneratorWindow(grid.localHour[r]!, v.generatorHours as [number, number])
        : prepared.generatorAllowed[r] === 1;
    }
    genRunning = generator ? generatorRuns(genRunning, genAllowed, (q / cap) * 100, generator.startSocPct, generator.stopSocPct) : false;
    if (genRunning) genHours++;

    const onShore = prepared.shore[r] === 1;
    const powered = !disc || onShore || genRunning;
    const dm = prepared.demand[powered ? 1 : 0];
    const cab = powered ? prepared.cabinHeatedC[r]! : ta;
    // With shore power or a running generator, AC loads and the inverter are off the bank.
    const acOnBank = !(onShore || genRunning);
    const demandW = dm.dcW[r]! + (acOnBank ? inverterDcWatts(dm.acW[r]!, plan.inverter) : 0);
    const chargerA = alternatorA * prepared.driveFrac[r]! + (onShore ? shoreA : 0) + (genRunning ? generatorA : 0);

    const lockout = coldChargeBlocked(chem, tb, bank.selfHeating);
    const accMax = lockout ? 0 : maxChargeA * (lead ? f : 1);
    const qFloor = cap * (1 - f + floor);
    const qStart = q;
    const discAtStart = disc;

    let solarSum = 0;
    let chargerSum = 0;
    let curtailedSum = 0;
    let coldCutSum = 0;
    let fullCutSum = 0;
    let limitCutSum = 0;
    let servedSum = 0;
    let inAh = 0;
    let outAh = 0;
    let outRawAh = 0;
    let netASum = 0;
    let vSum = 0;
    let refused = false;
    let collapsed = false;
    let wasDisc = disc;

    // Panels per solar sub-step (each battery sub-step uses the solar sub-step it lies in).
    const hasSun = prepared.sunAltitudeDeg[r]! >= darkDeg[grid.stop[r]!]!;
    let lastSi = -1;
    let pm = 0;
    let ipwm = 0;
    for (let j = 0; j < M; j++) {
      const si = r * SUBSTEPS + Math.floor(j * solarPerBattery);
      if (si !== lastSi) {
        lastSi = si;
        pm = 0;
        ipwm = 0;
        if (hasSun) {
          for (let x = 0; x < nMppt; x++) {
            const a = mpptIdx[x]!;
            const w = perWattSubs[a]![si]! * arrMul[a]!;
            pm += w < arrCap[a]! ? w : arrCap[a]!;
          }
          for (let x = 0; x < nPwm; x++) {
            const a = pwmIdx[x]!;
            const i = perWattSubs[a]![si]! * arrMul[a]!;
            ipwm += i < arrCap[a]! ? i : arrCap[a]!;
          }
        }
      }
      const isrc = ipwm + chargerA;
      let tLeft = dt;
      // At most three passes: a floor or collapse part-way through turns the rest into a disconnected pass.
      for (let pass = 0; pass < 3 && tLeft > 1e-12; pass++) {
        while (seg < oLast && q > oQ[seg + 1]!) seg++;
        while (seg > 0 && q < oQ[seg]!) seg--;
        const ocv = oV[seg]! + oS[seg]! * ((q < 0 ? 0 : q > cap ? cap : q) - oQ[seg]!);
        const load = disc ? 0 : demandW;
        let iBank = busCurrentOrNaN(ocv, ohms, isrc, load - pm);
        let servedFrac = 1;
        if (Number.isNaN(iBank)) {
          collapsed = true;
          if (cutoffV !== null) {
            // Voltage collapse with a cutoff: the bank disconnects here, the rest of the hour is unmet.
            disc = true;
            wasDisc = true;
            reason = CUTOFF_VOLTS;
            usableAtVoltCut = usableOf(cap, q, f);
            reconnectRow = r + 2;
            if (cutoffEvent[r] === CUTOFF_NONE) cutoffEvent[r] = CUTOFF_VOLTS;
            continue;
          }
          // Without a cutoff the loads get what the bank's maximum power delivers.
          const b = ocv - isrc * ohms;
          iBank = b / (2 * ohms);
          const vt = ocv - iBank * ohms;
          const delivered = (iBank + isrc) * vt + pm;
          servedFrac = load > 0 ? Math.max(0, Math.min(1, delivered / load)) : 1;
        }
        const vt = ocv - iBank * ohms;
        if (iBank > 0) {
          // Discharging: Peukert on this sub-step's net current, floor on usable charge.
          const removed = (iBank > i20 && k !== 1 ? iBank * peukertFactor(iBank, cap, k) : iBank) * tLeft;
          let tUsed = tLeft;
          let floorHit = false;
          if (q - removed <= qFloor + EPS * cap) {
            const phi = removed > 0 ? Math.max(0, Math.min(1, (q - qFloor) / removed)) : 0;
            tUsed = phi * tLeft;
            q = Math.max(Math.min(q, qFloor), q - removed * phi);
            floorHit = true;
          } else {
            q -= removed;
          }
          outAh += removed * (tUsed / tLeft);
          outRawAh += iBank * tUsed;
          netASum += iBank * tUsed;
          vSum += vt * tUsed;
          solarSum += (pm + ipwm * vt) * tUsed;
          chargerSum += chargerA * vt * tUsed;
          servedSum += load * servedFrac * tUsed;
          tLeft -= tUsed;
          if (floorHit) {
            disc = true;
            wasDisc = true;
            reason = CUTOFF_FLOOR;
            cutoffEvent[r] = CUTOFF_FLOOR;
          }
        } else {
          // Charging (or balanced): limited by the acceptance at each moment's SOC, solved exactly.
          const want = -iBank;
          if (lockout && want > EPS && q < cap - EPS) refused = true;
          // The acceptance falls as the bank fills: if it still covers `want` at the free end point it
          // covered it all along; otherwise the exact tapered charge bounds it.
          const q0 = q;
          const qNew = acceptedQ(q0, want, tLeft, accMax, cap, kneeAh, knee, eta);
          const got = qNew > q ? (qNew - q) / (eta * tLeft) : 0;
          q = qNew > q ? qNew : q;
          const vc = ocv + got * ohms;
          const solarTot = pm + ipwm * vc;
          const chgTot = chargerA * vc;
          if (got < want - 1e-12) {
            // Acceptance binds: chargers are throttled before solar; solar left over is curtailed.
            const needed = load + got * vc;
            const sUsed = Math.min(solarTot, needed);
            const cUsed = Math.max(0, Math.min(chgTot, needed - sUsed));
            solarSum += sUsed * tLeft;
            chargerSum += cUsed * tLeft;
            const cut = solarTot - sUsed;
            curtailedSum += cut * tLeft;
            if (cut > 0) {
              // Why: solar a warm bank would have taken is the cold's; of the rest, what the bank's flat
              // maximum current would have taken is the taper's (nearly full); what is left is that limit's.
              let gotWarm = got;
              if (accMax !== maxChargeA) {
                const qWarm = acceptedQ(q0, want, tLeft, maxChargeA, cap, kneeAh, knee, eta);
                gotWarm = qWarm > q0 ? (qWarm - q0) / (eta * tLeft) : 0;
              }
              const cutWarm = Math.min(cut, Math.max(0, solarTot - (load + gotWarm * vc)));
              const cutFlat = Math.min(cutWarm, Math.max(0, solarTot - (load + Math.min(want, maxChargeA) * vc)));
              coldCutSum += (cut - cutWarm) * tLeft;
              fullCutSum += (cutWarm - cutFlat) * tLeft;
              limitCutSum += cutFlat * tLeft;
            }
            vSum += vc * tLeft;
          } else {
            solarSum += (pm + ipwm * vt) * tLeft;
            chargerSum += chargerA * vt * tLeft;
            vSum += vt * tLeft;
          }
          inAh += got * tLeft;
          netASum -= got * tLeft;
          servedSum += load * tLeft;
          tLeft = 0;
        }
      }
    }
    if (q > cap) q = cap;
    if (q < 0) q = 0;

    // ---- volts: end of hour, average, and the hour's lowest with its biggest appliance (Revision 2) ----
    const iAvg = netASum; // A·h over one hour = average A, positive discharging
    const socEnd = q / cap;
    const vt = ocvAtSoc(ocvC, socEnd) - iAvg * ohms;
    const vAvg = vSum > 0 ? vSum : vt;
    const ocvLow = ocvAtSoc(ocvC, Math.min(qStart, q) / cap);
    let vMin = ocvLow - iAvg * ohms;
    if (!discAtStart) {
      const pk = acOnBank ? dm.peakAllW[r]! : dm.peakDcW[r]!;
      const pkAvg = acOnBank ? dm.peakAllAvgW[r]! : dm.peakDcAvgW[r]!;
      if (pk > 0) {
        const ipk = dischargeCurrent(ocvLow, ohms, pk) ?? (ohms > 0 ? ocvLow / (2 * ohms) : 0);
        vMin = ocvLow - (iAvg + ipk - pkAvg / vAvg) * ohms;
      }
    }
    let voltCode = 'voltage-cutoff';
    if (!discAtStart && !disc && cutoffV !== null && vMin <= cutoffV) {
      // Checked for the hour; the bank is off from the next hour, for at least that hour.
      disc = true;
      reason = CUTOFF_VOLTS;
      usableAtVoltCut = usableOf(cap, q, f);
      reconnectRow = r + 2;
      cutoffEvent[r] = CUTOFF_VOLTS;
      if (cutoffV < vAvg) voltCode = 'surge-cutoff';
    }
    if (collapsed) {
      warnings.push({
        code: 'voltage-collapse',
        row: r,
        message:
          cutoffV !== null
            ? 'The bank cannot deliver the loads\u2019 power (its voltage collapses under the draw): it disconnects, and the rest of the hour goes unmet.'
            : 'The bank cannot deliver the loads\u2019 power (its voltage collapses under the draw): part of the hour goes unmet.',
      });
    }
    // A bank that starts at or below its floor was announced before the loop: one warning, not two.
    if (cutoffEvent[r] !== CUTOFF_NONE && !(r === 0 && startedDisconnected)) {
      if (firstCutoffRow === null) firstCutoffRow = r;
      if (cutoffEvent[r] === CUTOFF_FLOOR) {
        warnings.push({ code: 'floor-cutoff', row: r, message: `The bank's usable charge reaches its ${fmt(bank.floorSocPct, 1)} % floor and it disconnects; loads go unmet until charging lifts it to ${fmt(bank.floorSocPct + 5, 1)} %.` });
      } else if (!collapsed) {
        warnings.push(
          voltCode === 'surge-cutoff'
            ? { code: 'surge-cutoff', row: r, message: `The hour's biggest appliance pulls the bank down to ${fmt(vMin, 2)} V, at or below the ${fmt(cutoffV ?? 0, 2)} V cutoff: it disconnects from the next hour.` }
            : { code: 'voltage-cutoff', row: r, message: `The bank's voltage falls to ${fmt(vMin, 2)} V, at or below the ${fmt(cutoffV ?? 0, 2)} V cutoff: it disconnects from the next hour.` },
        );
      }
    }
    if (refused) {
      coldHours++;
      warnings.push({ code: 'cold-charge-blocked', row: r, message: `The battery is at ${fmt(tb, 1)} °C: the LiFePO4 bank takes no charge below 0 °C, so this hour's charge is refused.` });
    }
    if (acOnBank && dm.inverterOverload[r] === 1) {
      warnings.push({ code: 'inverter-overload', row: r, message: 'The AC loads that can run in this hour exceed the inverter\u2019s continuous or surge rating: the plan cannot run as written.' });
    }

    const unmet = demandW - servedSum;
    socStartPct[r] = (qStart / cap) * 100;
    socEndPct[r] = socEnd * 100;
    usablePctA[r] = (Math.max(0, q - qStranded) / cap) * 100;
    volts[r] = vt;
    minVoltsA[r] = vMin;
    avgVoltsA[r] = vAvg;
    solarW[r] = solarSum;
    chargeW[r] = chargerSum;
    loadW[r] = servedSum;
    unmetW[r] = unmet > 1e-9 ? unmet : 0;
    curtailedW[r] = curtailedSum > 0 ? curtailedSum : 0;
    curtailedColdW[r] = coldCutSum > 0 ? coldCutSum : 0;
    curtailedFullW[r] = fullCutSum > 0 ? fullCutSum : 0;
    curtailedLimitW[r] = limitCutSum > 0 ? limitCutSum : 0;
    ahIn[r] = inAh;
    ahOut[r] = outAh;
    ahOutRaw[r] = outRawAh;
    capF[r] = f;
    batteryC[r] = tb;
    cabinC[r] = cab;
    generatorOn[r] = genRunning ? 1 : 0;
    disconnected[r] = wasDisc ? 1 : 0;
    coldBlocked[r] = refused ? 1 : 0;

    if (socEndPct[r]! < minSoc) {
      minSoc = socEndPct[r]!;
      minRow = r;
    }
    if (vMin < minV) {
      minV = vMin;
      minVRow = r;
    }
    if (usablePctA[r]! < minUsable) minUsable = usablePctA[r]!;
    unmetWh += unmetW[r]!;
    solarWh += solarSum;
    curtailedWh += curtailedW[r]!;
    curtailedColdWh += curtailedColdW[r]!;
    curtailedFullWh += curtailedFullW[r]!;
    curtailedLimitWh += curtailedLimitW[r]!;
    chargeWh += chargerSum;
    loadWh += servedSum;

    // ---- the battery follows its surroundings with thermal lag (Revision 2) ----
    tb = thermalStep(tb, inCabin ? cab : ta, bank.thermalHours);
  }

  return {
    n,
    bank,
    chargers: v.chargers,
    arrayWatts: v.arrayWatts,
    socStartPct,
    socEndPct,
    usablePct: usablePctA,
    volts,
    minVolts: minVoltsA,
    avgVolts: avgVoltsA,
    solarW,
    chargeW,
    loadW,
    unmetW,
    curtailedW,
    curtailedColdW,
    curtailedFullW,
    curtailedLimitW,
    ahIn,
    ahOut,
    ahOutRaw,
    capacityFactor: capF,
    batteryC,
    cabinC,
    generatorOn,
    disconnected,
    coldBlocked,
    cutoffEvent,
    warnings,
    summary: {
      startSocPct: bank.initialSocPct,
      minSocPct: minSoc === Infinity ? bank.initialSocPct : minSoc,
      minSocRow: minRow,
      firstCutoffRow,
      unmetWh,
      solarWh,
      curtailedWh,
      curtailedColdWh,
      curtailedFullWh,
      curtailedLimitWh,
      chargeWh,
      loadWh,
      generatorHours: genHours,
      generatorLitres: genHours * (generator ? generator.fuelLitresPerHour : 0),
      endSocPct: n > 0 ? socEndPct[n - 1]! : bank.initialSocPct,
      coldBlockedHours: coldHours,
      minVolts: minV === Infinity ? 0 : minV,
      minVoltsRow: minVRow,
      minUsablePct: minUsable === Infinity ? 0 : minUsable,
    },
  };
}
