/**
 * Physical constants and engine-wide defaults. Every value carries its source; "from memory"
 * marks an engineering default still to be confirmed against a maker's data or a standard.
 * Nothing is imported at run time; the one import is a type, erased when compiled.
 */
import type { ClimateSettings } from './auxiliary-power';

/** Version of the calculation engine; stored with saved results so they can be re-run. */
export const ENGINE_VERSION = '1.2.0';

/** Standard acceleration of gravity, m/s². Exact by definition (3rd CGPM, 1901). */
export const STANDARD_GRAVITY_MPS2 = 9.80665;

/** ISA sea-level temperature, K (U.S. Standard Atmosphere 1976). */
export const ISA_SEA_LEVEL_TEMPERATURE_K = 288.15;

/** ISA sea-level pressure, Pa (U.S. Standard Atmosphere 1976). */
export const ISA_SEA_LEVEL_PRESSURE_PA = 101_325;

/** ISA tropospheric temperature lapse rate, K/m (U.S. Standard Atmosphere 1976). */
export const ISA_LAPSE_RATE_K_PER_M = 0.0065;

/**
 * ISA pressure exponent g0·M0/(R*·L) = 5.255876 (U.S. Standard Atmosphere 1976 constants
 * R* = 8.31432 J/(mol·K), M0 = 0.0289644 kg/mol).
 */
export const ISA_PRESSURE_EXPONENT = 5.255876;

/** Upper end of the ISA troposphere (geopotential altitude), m (U.S. Standard Atmosphere 1976). */
export const ISA_TROPOPAUSE_ALTITUDE_M = 11_000;

/** Lowest altitude the engine accepts, m (common practice: below the Dead Sea shore, −430 m). */
export const MIN_ALTITUDE_M = -1_000;

/**
 * Specific gas constant of dry air used for ρ = p/(R·T), J/(kg·K). The product design fixes
 * 287.05; U.S. Standard Atmosphere 1976 gives R* ÷ M0 = 287.053.
 */
export const SPECIFIC_GAS_CONSTANT_AIR_J_PER_KG_K = 287.05;

/** Offset between the Celsius and Kelvin scales, K (SI definition). */
export const CELSIUS_TO_KELVIN_K = 273.15;

/** Stefan–Boltzmann constant, W/(m²·K⁴) (CODATA 2018, exact since the 2019 SI redefinition). */
export const STEFAN_BOLTZMANN_W_PER_M2_K4 = 5.670374419e-8;

/** WGS 84 semi-major axis, m (NIMA TR8350.2, WGS 84 definition). */
export const WGS84_SEMI_MAJOR_AXIS_M = 6_378_137;

/** WGS 84 flattening (NIMA TR8350.2, WGS 84 definition). */
export const WGS84_FLATTENING = 1 / 298.257223563;

/** Joules per watt-hour (SI definition). */
export const JOULES_PER_WH = 3_600;

/** Pounds-force per newton (exact: 1 lbf = 4.4482216152605 N). */
export const NEWTONS_PER_POUND_FORCE = 4.4482216152605;

/** Kilograms per avoirdupois pound (exact, international yard and pound agreement 1959). */
export const KG_PER_POUND = 0.45359237;

/** Metres per international mile (exact, 1959). */
export const METRES_PER_MILE = 1_609.344;

/** Watts per mechanical horsepower (550 ft·lbf/s = 745.6999 W). */
export const WATTS_PER_HORSEPOWER = 745.6998715822702;

/** Default resampling spacing along the route, m (product design: default 10 m). */
export const DEFAULT_SPACING_M = 10;

/**
 * Longest route one analysis accepts, m. The longest mountain lines run well under 100 km one
 * way; 300 km leaves room for long regional lines while keeping one analysis to seconds of CPU
 * and tens of megabytes (common practice: bound work per request).
 */
export const MAX_ROUTE_LENGTH_M = 300_000;

/**
 * Most resampled points one analysis accepts: a 300 km route at 5 m spacing, or 60 km at 1 m.
 * Each point costs about 0.7 kB in the engine and the answer (measured with
 * scripts/bench-preview-load.ts), so the bound keeps one answer to tens of megabytes.
 */
export const MAX_RESAMPLED_POINTS = 60_000;

/**
 * Default elevation smoothing window, m (engine README §6.2, §6.3): grades from 25–30 m global
 * terrain models need a 100–300 m baseline; 150 m is the middle of that range (common practice).
 */
export const DEFAULT_SMOOTHING_WINDOW_M = 150;

/** Default lateral (curve) comfort acceleration for buses, m/s² (from memory: 1.0–1.5; engine README §7.1). */
export const DEFAULT_LATERAL_ACCELERATION_MPS2 = 1.2;

/**
 * Default comfort acceleration, m/s² (from memory: 0.8–1.2 m/s² for standing passengers; Powell &
 * Palacín, Urban Rail Transit 1(2) 2015, review the limits used on rail; engine README §7.2).
 */
export const DEFAULT_ACCELERATION_MPS2 = 1.0;

/** Default comfort service deceleration, m/s² (from memory: 1.0–1.3 m/s² for buses). */
export const DEFAULT_DECELERATION_MPS2 = 1.2;

/** Curvature radius cap on straights, m (from memory: R capped at about 10 km). */
export const MAX_CURVE_RADIUS_M = 10_000;

/** Default window for smoothing curvature along the route, m (from memory: 20–50 m). */
export const DEFAULT_CURVATURE_WINDOW_M = 30;

/**
 * Lowest speed the speed profile lets a vehicle fall to when its traction envelope cannot hold
 * the grade, m/s. The stretch is reported as traction-limited instead of stalling (common practice).
 */
export const CRAWL_SPEED_MPS = 0.5;

/** Default grade below which a stretch counts as descending, % (common practice). */
export const DEFAULT_DESCENT_GRADE_THRESHOLD_PERCENT = -3;

/** Default minimum length of a reported descent, m (common practice). */
export const DEFAULT_DESCENT_MIN_LENGTH_M = 500;

/** Default length of flats or short rises tolerated inside one descent, m (common practice). */
export const DEFAULT_DESCENT_GAP_TOLERANCE_M = 150;

/**
 * Default hysteresis for counting total ascent and descent on the smoothed profile, m
 * (from memory: 1–2 × the terrain model's vertical error, engine README §6.2).
 */
export const DEFAULT_ASCENT_THRESHOLD_M = 2;

/**
 * Longest gap without terrain that the analysis fills by linear interpolation between the
 * covered ends, m. Longer gaps, or gaps at either end of the route, are refused (common practice,
 * the same treatment engine README §6.4 gives bridges and tunnels).
 */
export const DEFAULT_MAX_GAP_FILL_M = 100;

/** Default brake-ambient heat-transfer law h = a + b·v: constant term, W/(m²·K) (engine README §4.3, from memory). */
export const BRAKE_CONVECTION_STILL_W_PER_M2_K = 12;

/**
 * Default brake heat-transfer speed term, W/(m²·K) per m/s. Linear in speed as measured by
 * McPhee & Johnson, Int. J. Thermal Sciences 47 (2008) 458–467; coefficients from memory, engine README §4.3.
 */
export const BRAKE_CONVECTION_SPEED_W_PER_M2_K_PER_MPS = 4.5;

/** Longest time step of the brake temperature update before it is sub-stepped, s (common practice). */
export const BRAKE_MAX_SUBSTEP_S = 2;

/** Speed of the UN R13 Type-II and Type-IIA reference descents, m/s (30 km/h, from memory; engine README §5.1). */
export const TYPE_II_SPEED_MPS = 30 / 3.6;

/** Length of the UN R13 Type-II reference descent along the road, m (6 km, from memory; engine README §5.1). */
export const TYPE_II_LENGTH_M = 6_000;

/** Grade of the UN R13 Type-II reference descent, % (Dir. 71/320/EEC Annex VII: at least 6 %). */
export const TYPE_II_GRADE_PERCENT = 6;

/** Grade of the UN R13 Type-IIA reference descent, % (Dir. 71/320/EEC Annex VII: at least 7 %). */
export const TYPE_IIA_GRADE_PERCENT = 7;

/** Sea-level ISA air density used for the reference descents, kg/m³ (U.S. Standard Atmosphere 1976). */
export const ISA_SEA_LEVEL_DENSITY_KG_PER_M3 = 1.225;

/**
 * Default ambient temperature of the worst credible case, °C: a hot summer afternoon in the
 * valleys (common practice: design for the hot day, when brakes cool worst).
 */
export const DEFAULT_WORST_CASE_AMBIENT_C = 35;

/** Default margin the advice keeps below the fade threshold, K (engineering judgement). */
export const DEFAULT_FADE_MARGIN_K = 50;

/**
 * Default road design limit, % (absolute grade). From memory: mountain road design guidelines
 * keep main roads to about 10–12 %, short stretches of minor roads reach 15–20 %; a route drawn
 * steeper than 15 % is more likely a terrain or routing error than a bus road.
 */
export const DEFAULT_MAX_ROAD_GRADE_PERCENT = 15;

/** Default crawl speed below which a long stretch is not drivable as drawn, km/h (walking pace, from memory). */
export const DEFAULT_CRAWL_SPEED_KPH = 5;

/** Default length of crawling that marks a stretch not drivable as drawn, m (engineering judgement). */
export const DEFAULT_CRAWL_DISTANCE_M = 200;

/**
 * Text the UI and API show beside every safety-relevant figure (brake-fade risk, speed and SOC
 * advice).
 */
export const ENGINEERING_CAUTION =
  'Figures are engineering estimates; local codes, the vehicle maker\u2019s limits and licensed ' + 'engineering judgement decide.';

/** Density of cabin air for ventilation and door losses, kg/m³ (ISA sea level at 15 °C, U.S. Standard Atmosphere 1976: 1.225). */
export const AIR_DENSITY_CABIN_KG_PER_M3 = 1.225;

/** Specific heat of dry air at constant pressure, J/(kg·K) (about 1005 near room temperature; from memory, the handbook value for air). */
export const AIR_SPECIFIC_HEAT_J_PER_KG_K = 1_005;

/**
 * Sensible heat a seated or standing passenger gives off, W (from memory: ASHRAE Handbook — Fundamentals,
 * chapter "Nonresidential cooling and heating load calculations", table of heat gain from
 * occupants: seated, very light work 70 W sensible of 115 W total; standing, light work 75 W).
 */
export const PASSENGER_SENSIBLE_HEAT_W = 70;

/** Usable capacity left at end of life when the vehicle does not state it (common practice: end of life at 80 %). */
export const DEFAULT_END_OF_LIFE_CAPACITY_FRACTION = 0.8;

/**
 * Climate settings of a 12 m single-deck bus, used where a vehicle profile states none of its own
 * (auxiliary-power.ts). Each value and its source:
 * - set points 18 °C heating, 25 °C cooling: from memory (bus and rail-vehicle comfort
 *   guidance puts short-ride winter cabins at about 15–20 °C);
 * - body heat-loss coefficient 350 W/K, fresh air 800 m³/h, 6 m³ of air exchanged per stop,
 *   3 kW base load (fans, lights, electronics, air compressor, steering pump): from memory, no
 *   published bus figure found for any of them. The UA and fresh air together (624 W/K) sit just
 *   above a published bracket: a battery-electric minibus measured at 227 W/K (6.8 kW at −7 °C
 *   for a 23 °C cabin; Bäuml et al., engine README source 26) times the roughly 2–2.5 times larger
 *   envelope of a 12 m bus (from memory). With
 *   them the cabin needs 17.5 kW of heat at −10 °C empty with the doors shut, inside the
 *   15–25 kW a 12 m bus needs at −10 °C (from memory), and the resistive total at −15 °C
 *   (23.6 kW) is close to the 12 m battery bus preset's winter constant of 22 kW (vehicle-presets.ts);
 * - heat pump 20 kW heat output, COP at the outdoor-air test temperatures of EN 14511-2
 *   (+7, +2, −7 °C; from memory) plus −10/−20 °C and +15 °C: 2.5 at +7 °C is the "up to 2.5 times
 *   as efficient as resistance heating" a bus heat-pump maker publishes (Thermo King TE Series
 *   announcement, Mass Transit magazine, 2024), and the "up to 60 %" lower HVAC power of a
 *   heat-pump city bus in a year-round simulation (Widmer et al., arXiv:2303.00571, 2023; engine
 *   README source 25) is the same COP of 2.5; the fall towards the cold is from memory (no
 *   published bus heat-pump curve found);
 * - heat-pump lower limit −10 °C: from memory and cautious; CO₂ (R744) bus heat pumps are
 *   published as working down to −20 °C (r744.com, report on bus heat pumps, 2021);
 * - cooling EER 2.0: from memory;
 * - 30 min of pre-conditioning: common practice; cabin heat capacity 800 kJ/K (its air, about
 *   85 kJ/K, plus seats, panels and floor): from memory.
 */
export const DEFAULT_CLIMATE = {
  heatingSetpointC: 18,
  coolingSetpointC: 25,
  bodyUaWPerK: 350,
  freshAirM3PerH: 800,
  doorAirExchangeM3: 6,
  baseLoadW: 3_000,
  heatPumpHeatW: 20_000,
  heatPumpCop: [
    { ambientC: -20, cop: 1.4 },
    { ambientC: -10, cop: 1.7 },
    { ambientC: -7, cop: 1.9 },
    { ambientC: 2, cop: 2.2 },
    { ambientC: 7, cop: 2.5 },
    { ambientC: 15, cop: 3.0 },
  ],
  heatPumpMinAmbientC: -10,
  coolingEer: 2.0,
  preconditioningS: 1_800,
  cabinHeatCapacityJPerK: 800_000,
} as const satisfies ClimateSettings;
