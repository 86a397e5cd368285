// Stage two of a forecast: the hourly battery loop for one variant of a prepared trip
// (forecast-engine.md steps 9, 12, 13 and "Chargers and battery").
import { z } from 'zod';
import { capacityFactor, coldChargeBlocked, peukertFactor, taperFactor, terminalVolts } from './battery';
import { chargerWatts, dispatch, generatorRuns, inGeneratorWindow } from './chargers';
import { PlanValidationError, zodIssuesToEnvelope } from './errors';
import { SUBSTEPS, type PreparedTrip, type RowWarning } from './prepare';
import { controllerCapWatts, controllerFactor } from './pv';
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
/** The bank's terminal volts reached the cutoff. */
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
  chargeWh: number;
  loadWh: number;
  generatorHours: number;
  generatorLitres: number;
  endSocPct: number;
  coldBlockedHours: number;
}

/** Raw, unrounded result of one simulation: one entry per row in each array. */
export interface SimResult {
  n: number;
  bank: ResolvedBank;
  chargers: ResolvedCharger[];
  arrayWatts: number[];
  /** SOC % at the hour's start and end. */
  socStartPct: Float64Array;
  socEndPct: Float64Array;
  volts: Float64Array;
  solarW: Float64Array;
  chargeW: Float64Array;
  loadW: Float64Array;
  unmetW: Float64Array;
  curtailedW: Float64Array;
  /** Ah delivered to the bank's terminals (before charge efficiency). */
  ahIn: Float64Array;
  /** Ah removed from the bank, Peukert-adjusted. */
  ahOut: Float64Array;
  /** Ah drawn at the terminals (current × time, before Peukert). */
  ahOutRaw: Float64Array;
  /** Cold capacity factor f of the hour (SOC moves by Ah/(C·f)). */
  capacityFactor: Float64Array;
  batteryC: Float64Array;
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
    chargers: amps ? chargers.map((c, i) => ({ ...c, amps: amps[i] })) : chargers,
    arrayWatts: (v.arrayWatts ?? plan.arrays.map((a) => a.ratedWatts)).map((w) => w * scale),
    generatorHours: v.generatorHours ?? null,
  };
}

function fmt(x: number, digits: number): string {
  return (Math.round(x * 10 ** digits) / 10 ** digits).toFixed(digits);
}

/** Runs the hourly battery loop of a prepared trip for one variant (or the plan itself). */
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

  // ---- chargers by kind ----
  let alternatorW = 0;
  let shoreW = 0;
  let generator: ResolvedCharger | null = null;
  for (const c of v.chargers) {
    if (c.kind === 'alternator') alternatorW += chargerWatts(c.amps, vn);
    else if (c.kind === 'shore') shoreW += chargerWatts(c.amps, vn);
    else generator = c;
  }
  const generatorW = generator ? chargerWatts(generator.amps, vn) : 0;

  // ---- arrays: rated watts × cached per-watt output, then the controller ----
  const na = prepared.arrays.length;
  const arrRated = new Float64Array(na);
  const arrFactor = new Float64Array(na);
  const arrCap = new Float64Array(na);
  for (let a = 0; a < na; a++) {
    arrRated[a] = v.arrayWatts[a];
    arrFactor[a] = controllerFactor(prepared.arrays[a].spec, vn);
    arrCap[a] = controllerCapWatts(prepared.arrays[a].spec, vn);
  }

  const socStartPct = new Float64Array(n);
  const socEndPct = new Float64Array(n);
  const volts = new Float64Array(n);
  const solarW = new Float64Array(n);
  const chargeW = new Float64Array(n);
  const loadW = new Float64Array(n);
  const unmetW = new Float64Array(n);
  const curtailedW = new Float64Array(n);
  const ahIn = new Float64Array(n);
  const ahOut = new Float64Array(n);
  const ahOutRaw = new Float64Array(n);
  const capF = new Float64Array(n);
  const batteryC = new Float64Array(n);
  const generatorOn = new Uint8Array(n);
  const disconnected = new Uint8Array(n);
  const coldBlocked = new Uint8Array(n);
  const cutoffEvent = new Uint8Array(n);
  const warnings: RowWarning[] = [];

  let soc = bank.initialSocPct / 100;
  let disc = soc <= floor + EPS;
  let reason = disc ? CUTOFF_FLOOR : CUTOFF_NONE;
  let socAtVoltCut = 0;
  let reconnectRow = 0;
  let firstCutoffRow: number | null = null;
  if (disc) {
    firstCutoffRow = 0;
    cutoffEvent[0] = CUTOFF_FLOOR;
    warnings.push({ code: 'floor-cutoff', row: 0, message: `The bank starts at ${fmt(soc * 100, 1)} %, at or below its ${fmt(bank.floorSocPct, 1)} % floor, so it starts disconnected; loads go unmet until charging lifts it to ${fmt(bank.floorSocPct + 5, 1)} %.` });
  }
  let genRunning = false;
  let genHours = 0;
  let coldHours = 0;
  let minSoc = Infinity;
  let minRow = 0;
  let unmetWh = 0;
  let solarWh = 0;
  let curtailedWh = 0;
  let chargeWh = 0;
  let loadWh = 0;

  for (let r = 0; r < n; r++) {
    // ---- reconnect at the hour's start ----
    if (disc) {
      if (reason === CUTOFF_FLOOR && soc >= floor + 0.05 - EPS) disc = false;
      else if (reason === CUTOFF_VOLTS && r >= reconnectRow && soc >= Math.max(floor, socAtVoltCut) + 0.05 - EPS) disc = false;
      if (!disc) reason = CUTOFF_NONE;
    }

    // ---- generator, decided at the hour's start ----
    let genAllowed = false;
    if (generator) {
      genAllowed = v.generatorHours
        ? prepared.generatorSite[r] === 1 && inGeneratorWindow(grid.localHour[r], v.generatorHours as [number, number])
        : prepared.generatorAllowed[r] === 1;
    }
    genRunning = generator ? generatorRuns(genRunning, genAllowed, soc * 100, generator.startSocPct, generator.stopSocPct) : false;
    if (genRunning) genHours++;

    // ---- sources ----
    let solar = 0;
    for (let a = 0; a < na; a++) {
      const rated = arrRated[a];
      if (!(rated > 0)) continue;
      const pa = prepared.arrays[a];
      const f = arrFactor[a];
      const capW = arrCap[a];
      if (pa.perWattMax[r] * rated * f <= capW) {
        solar += pa.perWatt[r] * rated * f;
      } else {
        // The cap binds in part of the hour: apply it sub-step by sub-step.
        let sum = 0;
        const base = r * SUBSTEPS;
        for (let s = 0; s < SUBSTEPS; s++) sum += Math.min(pa.perWattSub[base + s] * rated * f, capW);
        solar += sum / SUBSTEPS;
      }
    }
    const driving = grid.driving[r] === 1;
    const onShore = prepared.shore[r] === 1;
    const charger = (driving ? alternatorW : 0) + (onShore ? shoreW : 0) + (genRunning ? generatorW : 0);
    // With shore power or a running generator, AC loads and the inverter are off the bank.
    const demand = prepared.dcLoadW[r] + (onShore || genRunning ? 0 : prepared.acBankW[r]);

    // ---- bank state for the hour ----
    const tb = bank.insideHeatedSpace ? 18 : prepared.ambientC[r];
    const f = capacityFactor(chem, tb);
    const capAh = cap * f;
    // The lockout only "refuses" charge a warm bank would have taken (not a full one).
    const warmAcceptA = soc < 1 ? maxChargeA * taperFactor(chem, soc) : 0;
    const blocked = coldChargeBlocked(chem, tb, bank.selfHeating) && warmAcceptA > 0;
    const acceptNominalA = blocked ? 0 : warmAcceptA;
    const socStart = soc;

    let solarUsed = 0;
    let chargerUsed = 0;
    let curtailed = 0;
    let served = 0;
    let inAh = 0;
    let outAh = 0;
    let outRawAh = 0;
    let refused = false;
    let wasDisc = disc;

    if (!disc) {
      // Room left in the bank, in terminal Ah, so SOC never passes 100 %.
      const roomAh = Math.max(0, ((1 - soc) * capAh) / eta);
      const d = dispatch(solar, charger, demand, Math.min(acceptNominalA, roomAh) * vn);
      if (d.fromBank > 0) {
        const current = d.fromBank / vn;
        const need = current * peukertFactor(current, cap, k);
        const avail = Math.max(0, (soc - floor) * capAh);
        if (need <= avail) {
          soc -= need / capAh;
          outAh = need;
          outRawAh = current;
          served = demand;
          solarUsed = solar;
          chargerUsed = charger;
          if (soc <= floor + EPS) {
            disc = true;
            reason = CUTOFF_FLOOR;
            cutoffEvent[r] = CUTOFF_FLOOR;
          }
        } else {
          // The floor is reached mid-hour: loads are served for the fraction φ it lasts, then the
          // bank disconnects and every source for the rest of the hour goes to charging.
          const phi = need > 0 ? avail / need : 0;
          const rest = 1 - phi;
          soc = floor;
          outAh = avail;
          outRawAh = current * phi;
          served = demand * phi;
          const room2 = Math.max(0, ((1 - soc) * capAh) / eta);
          const acceptW = Math.min(acceptNominalA * rest, room2) * vn;
          const restSupply = (solar + charger) * rest;
          const toBank = Math.min(restSupply, acceptW);
          const solarRest = Math.min(solar * rest, toBank);
          solarUsed = solar * phi + solarRest;
          chargerUsed = charger * phi + (toBank - solarRest);
          curtailed = solar * rest - solarRest;
          inAh = toBank / vn;
          soc += (inAh * eta) / capAh;
          refused = blocked && restSupply > EPS;
          disc = true;
          reason = CUTOFF_FLOOR;
          cutoffEvent[r] = CUTOFF_FLOOR;
        }
      } else {
        solarUsed = d.solarUsed;
        chargerUsed = d.chargerUsed;
        curtailed = d.curtailed;
        served = demand;
        inAh = d.toBank / vn;
        soc += (inAh * eta) / capAh;
        refused = blocked && solar + charger - demand > EPS;
      }
    } else {
      // Disconnected all hour: loads go unmet, all charging goes to the bank.
      const roomAh = Math.max(0, ((1 - soc) * capAh) / eta);
      const acceptW = Math.min(acceptNominalA, roomAh) * vn;
      const toBank = Math.min(solar + charger, acceptW);
      solarUsed = Math.min(solar, toBank);
      chargerUsed = toBank - solarUsed;
      curtailed = solar - solarUsed;
      inAh = toBank / vn;
      soc += (inAh * eta) / capAh;
      refused = blocked && solar + charger > EPS;
    }
    if (soc > 1) soc = 1;
    if (soc < 0) soc = 0;
    if (cutoffEvent[r] === CUTOFF_FLOOR) wasDisc = true;

    // ---- terminal volts at the hour's end, with the hour's average net current ----
    const netA = inAh - outRawAh;
    const vt = terminalVolts(chem, soc, vn, netA, bank.internalResistanceMilliohm);
    if (!disc && bank.cutoffVolts !== null && vt <= bank.cutoffVolts) {
      // Checked at the hour's end; the bank is off from the next hour, for at least that hour.
      disc = true;
      reason = CUTOFF_VOLTS;
      socAtVoltCut = soc;
      reconnectRow = r + 2;
      cutoffEvent[r] = CUTOFF_VOLTS;
    }
    if (cutoffEvent[r] !== CUTOFF_NONE) {
      if (firstCutoffRow === null) firstCutoffRow = r;
      warnings.push(
        cutoffEvent[r] === CUTOFF_FLOOR
          ? { code: 'floor-cutoff', row: r, message: `The bank reaches its ${fmt(bank.floorSocPct, 1)} % floor and disconnects; loads go unmet until charging lifts it to ${fmt(bank.floorSocPct + 5, 1)} %.` }
          : { code: 'voltage-cutoff', row: r, message: `The bank's voltage falls to ${fmt(vt, 2)} V, at or below the ${fmt(bank.cutoffVolts ?? 0, 2)} V cutoff: it disconnects from the next hour.` },
      );
    }
    if (refused) {
      coldHours++;
      warnings.push({ code: 'cold-charge-blocked', row: r, message: `The battery is at ${fmt(tb, 1)} °C: the LiFePO4 bank takes no charge below 0 °C, so this hour's charge is refused.` });
    }

    const unmet = demand - served;
    socStartPct[r] = socStart * 100;
    socEndPct[r] = soc * 100;
    volts[r] = vt;
    solarW[r] = solarUsed;
    chargeW[r] = chargerUsed;
    loadW[r] = served;
    unmetW[r] = unmet > 0 ? unmet : 0;
    curtailedW[r] = curtailed > 0 ? curtailed : 0;
    ahIn[r] = inAh;
    ahOut[r] = outAh;
    ahOutRaw[r] = outRawAh;
    capF[r] = f;
    batteryC[r] = tb;
    generatorOn[r] = genRunning ? 1 : 0;
    disconnected[r] = wasDisc ? 1 : 0;
    coldBlocked[r] = refused ? 1 : 0;

    if (socEndPct[r] < minSoc) {
      minSoc = socEndPct[r];
      minRow = r;
    }
    unmetWh += unmetW[r];
    solarWh += solarUsed;
    curtailedWh += curtailedW[r];
    chargeWh += chargerUsed;
    loadWh += served;
  }

  return {
    n,
    bank,
    chargers: v.chargers,
    arrayWatts: v.arrayWatts,
    socStartPct,
    socEndPct,
    volts,
    solarW,
    chargeW,
    loadW,
    unmetW,
    curtailedW,
    ahIn,
    ahOut,
    ahOutRaw,
    capacityFactor: capF,
    batteryC,
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
      chargeWh,
      loadWh,
      generatorHours: genHours,
      generatorLitres: genHours * (generator ? generator.fuelLitresPerHour : 0),
      endSocPct: n > 0 ? socEndPct[n - 1] : bank.initialSocPct,
      coldBlockedHours: coldHours,
    },
  };
}
