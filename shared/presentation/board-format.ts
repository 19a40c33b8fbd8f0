/**
 * Numbers for the board, in plain words: whole numbers with thousands separators, "million"
 * spelled out, money in the network's currency, CO₂ in tonnes. Missing or non-finite values read
 * "—" so a printed page never shows "NaN".
 */

const LOCALE = 'en-GB';
const MILLION = 1_000_000;

/** 8 450 → "8,450"; 412 345 → "412,000"; 1 234 567 → "1.23 million". */
export function formatBoardNumber(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const magnitude = Math.abs(value);
  if (magnitude >= MILLION) {
    return `${(value / MILLION).toLocaleString(LOCALE, { maximumSignificantDigits: 3 })} million`;
  }
  if (magnitude >= 10_000) return roundToSignificant(value, 3).toLocaleString(LOCALE, { maximumFractionDigits: 0 });
  if (magnitude >= 100) return value.toLocaleString(LOCALE, { maximumFractionDigits: 0 });
  return value.toLocaleString(LOCALE, { maximumFractionDigits: 1 });
}

/** Energy in kWh as the board reads it: "412,000 kWh", "1.23 million kWh". */
export function formatBoardEnergy(kWh: number | null | undefined): string {
  const number = formatBoardNumber(kWh);
  return number === '—' ? number : `${number} kWh`;
}

/** Money in the network's currency, no cents: "€48,200", "CHF 1.2 million" (no line break after a code). */
export function formatBoardMoney(amount: number | null | undefined, currency: string): string {
  if (amount === null || amount === undefined || !Number.isFinite(amount)) return '—';
  const options: Intl.NumberFormatOptions = { style: 'currency', currency, maximumFractionDigits: 0, minimumFractionDigits: 0 };
  if (Math.abs(amount) >= MILLION) {
    // Currency symbol from Intl, "million" in words (compact notation would print "M").
    const symbol = new Intl.NumberFormat(LOCALE, options).formatToParts(0).find((part) => part.type === 'currency')?.value ?? currency;
    const millions = (amount / MILLION).toLocaleString(LOCALE, { maximumSignificantDigits: 3 });
    return /^[A-Z]{3}$/.test(symbol) ? `${symbol}\u00a0${millions} million` : `${symbol}${millions} million`;
  }
  return new Intl.NumberFormat(LOCALE, options).format(roundToSignificant(amount, 3));
}

/** CO₂ from kg to tonnes: 312 400 kg → "312 t"; 840 kg → "0.8 t". */
export function formatBoardCo2(kg: number | null | undefined): string {
  if (kg === null || kg === undefined || !Number.isFinite(kg)) return '—';
  return `${formatBoardNumber(kg / 1_000)} t`;
}

/** Tariff with its unit and full precision: "0.21 EUR per kWh". */
export function formatTariff(perKWh: number, currency: string): string {
  return `${perKWh.toLocaleString(LOCALE, { maximumFractionDigits: 4 })} ${currency} per kWh`;
}

function roundToSignificant(value: number, digits: number): number {
  if (value === 0) return 0;
  const scale = 10 ** (Math.floor(Math.log10(Math.abs(value))) - digits + 1);
  return Math.round(value / scale) * scale;
}
