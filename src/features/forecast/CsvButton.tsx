import type { Forecast } from '../../engine';
import type { Units } from '../../lib/units';

/** Downloads the hourly numbers: the saved forecast's CSV route when there is an id, else a CSV built here. */
export default function CsvButton({ forecast, forecastId, name, units = 'metric' }: { forecast: Forecast; forecastId?: string | null; name?: string; units?: Units }) {
  if (forecastId) {
    return (
      <a className="btn btn-quiet no-print" href={`/api/forecasts/${encodeURIComponent(forecastId)}/hourly.csv`} download data-testid="csv-download">
        Download CSV
      </a>
    );
  }
  const download = async () => {
    // The CSV writer (papaparse) loads on the first download.
    const { csvFileName, forecastCsv } = await import('../../domain/forecasts/hourly-csv');
    const blob = new Blob([forecastCsv(forecast, units)], { type: 'text/csv;charset=utf-8' });
    const url = URL.createObjectURL(blob);
    const a = document.createElement('a');
    a.href = url;
    a.download = csvFileName(forecast, name);
    document.body.appendChild(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 1000);
  };
  return (
    <button type="button" className="btn btn-quiet no-print" onClick={() => void download()} data-testid="csv-download">
      Download CSV
    </button>
  );
}
