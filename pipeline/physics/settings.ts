/**
 * The `physics:` section of the atlas configuration: modelling choices of the physics stage that
 * change the WBGT. Shape and defaults only (zod); every key has a default, so a configuration
 * without `physics:` works. Not re-exported by the stage's index (the browser never needs zod).
 */
import { z } from 'zod';
import { D_GLOBE_STANDARD } from './constants.ts';
import { GLOBE_DIAMETER_RANGE } from './liljegren-solve.ts';

/** zod schema of the `physics:` section. */
export const physicsSettingsSchema = z
  .object({
    /**
     * Diameter of the black globe the model computes [m]: 0.15 (the standard 150 mm globe the
     * screening limits are defined with, the default) or 0.0508 (the 2-inch globe of the
     * Liljegren et al. 2008 reference implementation), or any value in 0.025–0.3 m.
     */
    globeDiameter: z
      .number()
      .min(GLOBE_DIAMETER_RANGE[0], `must be at least ${GLOBE_DIAMETER_RANGE[0]} m (the diameter is in metres: 0.15 for the 150 mm standard globe)`)
      .max(GLOBE_DIAMETER_RANGE[1], `must be at most ${GLOBE_DIAMETER_RANGE[1]} m (the diameter is in metres: 0.15 for the 150 mm standard globe)`)
      .default(D_GLOBE_STANDARD),
  })
  .strict()
  .default({});

export type PhysicsSettings = z.infer<typeof physicsSettingsSchema>;
