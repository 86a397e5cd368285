import type { BaselineResult, DayAh } from './baseline';
import type { ColumnMapping } from './mapping';
import type { SeriesPoint } from './series';

// Monitor logs as the API returns them (shared by the server and the Logs section).

export interface MonitorLogDto {
  id: string;
  rigId: string;
  name: string;
  bytes: number;
  timeZone: string;
  sampleCount: number;
  startedAt: string;
  endedAt: string;
  mapping: ColumnMapping;
  /** Which readings the log has. */
  has: { volts: boolean; amps: boolean; soc: boolean; temperature: boolean };
  createdBy: { id: string; name: string } | null;
  createdAt: string;
  version: number;
}

export interface ForecastOverlap {
  id: string;
  name: string;
  tripId: string;
  tripName: string;
  createdAt: string;
  /** Hours the forecast and the log share. */
  overlapHours: number;
}

export interface MonitorLogDetail extends MonitorLogDto {
  series: SeriesPoint[];
  baseline: BaselineResult;
  nightTempC: number | null;
  days: DayAh[];
  /** Saved forecasts of this rig whose dates the log covers, most overlap first. */
  forecasts: ForecastOverlap[];
}
