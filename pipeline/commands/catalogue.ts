/**
 * Imports every stage's error specs so the catalogue is complete, here where the commands are
 * (the one place that may know every stage). Add a stage's errors.ts here.
 */
import '../model/errors.ts';
import '../config/errors.ts';
import '../publish/layers/errors.ts';
import '../publish/cell-figures-errors.ts';
import '../publish/point-tile-errors.ts';
import '../work/errors.ts';
import '../work/shift-errors.ts';
import '../read/errors.ts';
import '../climate/errors.ts';
import '../climate/stack-errors.ts';
import '../../src/data/errors.ts';
import '../schedule/errors.ts';
import '../regions/errors.ts';
import '../reduce/errors.ts';
import '../physics/errors.ts';
import '../demo/errors.ts';
import '../run/errors.ts';
import '../formats/errors.ts';
import '../scenario/errors.ts';
