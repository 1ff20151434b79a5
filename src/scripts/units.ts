/**
 * The °C/°F switch of every page (loaded by components/UnitSwitch.astro). The chosen unit comes
 * from the `?units=F` query parameter, else localStorage, else °C; it is written to
 * `<html data-units>`, applied to every element of the src/lib/units.ts convention, kept in
 * localStorage, and announced with the `heathours:units` event for scripts that draw their own
 * temperatures. A choice made in another tab (the `storage` event) or while the page sat in the
 * back/forward cache (`pageshow` with `persisted`) is followed too.
 */
import {
  UNIT_EVENT,
  UNIT_QUERY_PARAM,
  UNIT_STORAGE_KEY,
  formatTemperature,
  formatTemperatureDelta,
  formatTemperatureList,
  parseUnit,
  temperatureTextIn,
  unitSymbol,
  type TemperatureUnit,
} from '../lib/units.ts';

function stored(): string | null {
  try {
    return localStorage.getItem(UNIT_STORAGE_KEY);
  } catch {
    return null;
  }
}

/** Rewrites every temperature of the convention inside `root` in `unit`. */
export function applyUnits(unit: TemperatureUnit, root: ParentNode = document): void {
  for (const el of root.querySelectorAll<HTMLElement>('[data-temp-c]')) {
    const digits = Number(el.dataset.digits ?? 1);
    el.textContent = formatTemperature(Number(el.dataset.tempC), unit, digits, el.hasAttribute('data-temp-signed'));
  }
  for (const el of root.querySelectorAll<HTMLElement>('[data-temp-delta-c]')) {
    const digits = Number(el.dataset.digits ?? 1);
    // A difference keeps the sign style it was rendered with: "+0.5 °C" or, after a "+" of its own, "1 °C".
    el.dataset.deltaSign ??= (el.textContent ?? '').trim().startsWith('+') ? 'plus' : 'none';
    el.textContent = formatTemperatureDelta(Number(el.dataset.tempDeltaC), unit, digits, el.dataset.deltaSign === 'plus');
  }
  for (const el of root.querySelectorAll<HTMLElement>('[data-temp-list-c]')) {
    el.textContent = formatTemperatureList((el.dataset.tempListC ?? '').split(',').map(Number), unit);
  }
  for (const el of root.querySelectorAll<Element>('[data-temp-text]')) {
    el.textContent = temperatureTextIn(el.getAttribute('data-temp-text') ?? '', unit);
  }
  for (const el of root.querySelectorAll<HTMLElement>('[data-unit-label]')) el.textContent = unitSymbol(unit);
}

function setUnit(unit: TemperatureUnit, persist: boolean): void {
  document.documentElement.dataset.units = unit;
  applyUnits(unit);
  for (const b of document.querySelectorAll<HTMLButtonElement>('[data-unit-choice]')) {
    b.setAttribute('aria-pressed', String(b.dataset.unitChoice === unit));
  }
  if (persist) {
    try {
      localStorage.setItem(UNIT_STORAGE_KEY, unit);
    } catch {
      // Storage may be off (private mode): the choice then lasts for this page only.
    }
  }
  document.dispatchEvent(new CustomEvent(UNIT_EVENT, { detail: { unit } }));
}

const query = new URLSearchParams(location.search).get(UNIT_QUERY_PARAM);
setUnit(parseUnit(query ?? stored()), query !== null);
for (const b of document.querySelectorAll<HTMLButtonElement>('[data-unit-choice]')) {
  b.hidden = false;
  b.addEventListener('click', () => setUnit(parseUnit(b.dataset.unitChoice), true));
}

/** Shows the stored choice if it differs from the page's (without writing it back). */
function followStored(): void {
  const unit = parseUnit(stored());
  if (unit !== document.documentElement.dataset.units) setUnit(unit, false);
}
// A choice made in another tab or window of the site.
window.addEventListener('storage', (e) => {
  if (e.key === UNIT_STORAGE_KEY) followStored();
});
// A page restored from the back/forward cache keeps the unit it had; the choice may have changed since.
window.addEventListener('pageshow', (e) => {
  if (e.persisted) followStored();
});
