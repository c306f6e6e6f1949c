// Numbers of an SPSS system file as the text SPSS would show.
//
// SPSS stores dates as seconds since the start of the Gregorian calendar, 14 October 1582
// 00:00:00 (GNU PSPP manual, "Time and Date Formats"); the Unix epoch is 12,219,379,200 seconds
// later. Format type codes are those of the variable record's print format (PSPP manual,
// "System File Format", "Variable Record": 20 DATE, 22 DATETIME, 23 ADATE, 24 JDATE, 28 MOYR,
// 29 QYR, 30 WKYR, 38 EDATE, 39 SDATE; 21 TIME and 25 DTIME are durations).

const SPSS_UNIX_EPOCH_SECONDS = 12_219_379_200;
const DATE_FORMATS = new Set([20, 23, 24, 28, 29, 30, 38, 39]);
const DATETIME_FORMATS = new Set([22]);
const DURATION_FORMATS = new Set([21, 25]);

export function spssNumberText(n: number, formatType: number): string {
  if (DATE_FORMATS.has(formatType) || DATETIME_FORMATS.has(formatType)) {
    const d = new Date((n - SPSS_UNIX_EPOCH_SECONDS) * 1000);
    if (Number.isNaN(d.getTime())) return String(n);
    const iso = d.toISOString();
    return DATE_FORMATS.has(formatType) ? iso.slice(0, 10) : iso.slice(0, 19).replace('T', ' ');
  }
  if (DURATION_FORMATS.has(formatType) && n >= 0) {
    const h = Math.floor(n / 3600);
    const m = Math.floor((n % 3600) / 60);
    const s = Math.round(n % 60);
    return `${h}:${String(m).padStart(2, '0')}:${String(s).padStart(2, '0')}`;
  }
  // 15 significant digits: what a binary64 holds exactly in decimal (IEEE 754-2008, 3.6).
  return String(Number(n.toPrecision(15)));
}
