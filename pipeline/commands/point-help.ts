/** The columns `point` reads and writes, as `heathours point --help` prints them after the options. */
export const POINT_HELP = `
Input columns (header names; order is free; one row per hour):
  required  time_utc       end of the averaging period, ISO 8601 (e.g. 2024-07-15T12:00:00Z)
            lat, lon       position [degrees north, degrees east]
            ta_c           air temperature [°C]
            rh_pct | td_c  relative humidity [%] or dew point [°C] (rh_pct is used when both are given)
            pressure_hpa   surface pressure [hPa]
            wind_ms        wind speed at wind_height_m [m/s]
            solar_wm2      global horizontal solar irradiance, mean over the period [W/m²]
  optional  avg_minutes    length of the averaging period [min] (default 60)
            wind_height_m  height of the wind measurement [m] (default 10; 2 = used as is)
            urban          1 for the urban wind-profile exponents, 0 rural (default 0)
            dt_c           vertical temperature difference for night stability [°C] (default 0)
            direct_fraction  direct-beam share of the solar [0-1] (default: estimated)
            cos_zenith     cosine of the solar zenith (default: computed for the period's middle)

Output: the input columns, then cos_zenith, direct_fraction, wind_2m_ms; in the sun tg_c, tnwb_c,
tpsy_c, wbgt_c; in the open-sky shade (the sun removed) tg_shade_c, tnwb_shade_c, wbgt_shade_c;
under a shelter at air temperature (roof, canopy) tg_shelter_c, tnwb_shelter_c, wbgt_shelter_c
[°C]; per workload class limit_<class>_c and work_fraction_<class>; status (ok, or why a row has
no values). Screening values for fit, hydrated workers; a competent person decides work/rest.`;
