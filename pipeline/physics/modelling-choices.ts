/**
 * The modelling choices that move the figures a lot without showing in the formulas, with the
 * reasoning for each default and its effect as measured on the invented demo atlas (demo data
 * 2020–2024, baseline 2020–2023, this code). The methods page renders them. The figures are
 * measurements of the demo, written down when the choice was made (the demo is deterministic, so
 * rebuilding it with the settings named gives them again); they describe no real place. Pure data.
 */

/** One modelling choice as the methods page shows it. */
export interface ModellingChoice {
  id: string;
  title: string;
  /** The default and the setting that changes it. */
  choice: string;
  /** Why the default is what it is, with its sources. */
  reasoning: string;
  /** The effect on the invented demo atlas, one measured statement per entry. */
  measured: string[];
}

export const MODELLING_CHOICES: readonly ModellingChoice[] = [
  {
    id: 'globe-diameter',
    title: 'The black globe: 150 mm, the globe the screening limits assume',
    choice: 'physics.globeDiameter = 0.15 m (the 2-inch globe of the Liljegren et al. 2008 reference implementation is 0.0508 m).',
    reasoning:
      'The WBGT screening limits of ISO 7243, NIOSH and ACGIH were set with WBGT measured by the standard black globe of 150 mm (6 in) diameter (Parsons 2006, describing ISO 7243; OSHA Technical Manual, Section III Chapter 4). A smaller globe is cooled more by the wind and reads lower in the sun, by several degrees (Oliveira et al. 2019), so a model of the 2-inch globe compared with those limits underestimates the heat stress in the sun. The energy balance of the model holds for any globe size (the sphere heat-transfer correlation takes the diameter), so the atlas computes the standard globe. The reference implementation\u2019s table is still checked at its own 2-inch globe, and the 150 mm globe against an independent solve of the same balance (scipy).',
    measured: [
      'Annual mean WBGT in the sun (all hours, night included) +0.36 to +0.40 °C per region; over sunlit hours the median per land cell rises by 0.38 to 0.86 °C (median of cells +0.80 °C).',
      'Shift hours above the limit for moderate work (300 W), acclimatized, in the sun: +42 % to +78 % per region (e.g. the Sollent coast 1,143 → 1,618 h a year); hours lost to rest breaks +77 % to +135 %.',
      'In the open-sky shade the larger globe reads slightly cooler (it sheds less heat to the air, so the cool sky weighs more): annual mean −0.07 to −0.11 °C, shift hours above the moderate limit −10 % to −19 %.',
      'Capacity loss (Kjellstrom et al. 2018, 300 W) in the sun +51 % to +62 % per region.',
    ],
  },
  {
    id: 'shade-model',
    title: 'Shade: the open sky with the sun removed; a shelter is warmer',
    choice:
      'The atlas\u2019s exposures are the sun and the shade by default, the shade being the open sky with the sun removed. The physics also computes a sheltered exposure (under a roof or canopy); `heathours point` writes it (wbgt_shelter_c), and an atlas publishes it as a third exposure when its configuration lists it (`work.exposures: [sun, shade, shelter]`).',
    reasoning:
      'Without the sun\u2019s load the globe and the wick still exchange long-wave radiation with the sky, which radiates like a body well below the air temperature; the open-sky shade is therefore cooler than the shade under a roof, where the globe sees a shelter at about the air temperature. The sheltered exposure takes the shelter as a black surface at the air temperature, the assumption of the indoor and in-shade WBGT of Lemke & Kjellstrom (2012), under which the globe reads the air temperature. Which one fits depends on the site: a worker under a tree or an awning is closer to the shelter, one in the shadow of a wall with open sky above closer to the open-sky shade.',
    measured: [
      'Sheltered WBGT minus open-sky shade WBGT, median over the hours of each land cell: +0.15 to +0.53 °C (median of the 655 cells +0.27 °C), with the 150 mm globe.',
      'Hours above the limit for moderate work (300 W), acclimatized, all hours 2020–2024: +56 % over all land cells (186,837 → 291,933 cell-hours); per cell +22 % to +289 % (median +64 %) where the shade has at least 50 such hours.',
      'Built as the atlas\u2019s third exposure (work.exposures), per region, baseline mean: annual mean WBGT +0.24 to +0.43 °C, shift hours above the moderate acclimatized limit +40 % to +102 % (the Sollent coast 69.6 → 110.6 h a year).',
    ],
  },
  {
    id: 'clothing-capacity-loss',
    title: 'Clothing in the capacity-loss functions',
    choice: 'The capacity-loss functions are evaluated at the effective WBGT, WBGT + CAV (work.clothing).',
    reasoning:
      'The loss functions of Kjellstrom et al. (2018) and Dunne et al. (2013) relate work capacity to the WBGT around workers in ordinary work clothes (Bröde et al. 2018, of the same group: light work clothes, 0.6 clo). The clothing adjustment value is the WBGT increment that makes an ensemble count like ordinary work clothes (ACGIH; Bernard et al. 2008 measured it against cotton work clothes), so WBGT + CAV is the WBGT at which workers in ordinary clothes would carry the same load, and the functions are given that. With work clothes (CAV 0) nothing changes.',
    measured: [
      'With a clothing adjustment of 3 °C instead of 0 (150 mm globe): capacity loss (Kjellstrom et al. 2018, 300 W) in the sun +142 % to +200 % per region (e.g. the Sollent coast 409 → 990 h a year); Dunne et al. 2013, heavy work, +53 % to +112 %.',
      'The same change moves the shift hours above the limit for moderate work in the sun by +67 % to +171 % and the hours lost by +146 % to +306 %: limits and loss functions now answer the clothing alike (before, capacity loss ignored it).',
    ],
  },
];
