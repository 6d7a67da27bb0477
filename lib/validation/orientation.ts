import { z } from "zod";

// Shared by the planner panels and the route handlers.
const finite = z.number().finite();

/** How far from length 1 a quaternion may be (float32 round trips stay far inside). */
export const UNIT_TOLERANCE = 1e-3;

export const quaternionInput = z
  .tuple([finite, finite, finite, finite])
  .refine((q) => Math.abs(Math.hypot(...q) - 1) <= UNIT_TOLERANCE, "The rotation must be a unit quaternion [x, y, z, w].");

/** PUT /api/parts/[partId]/orientation: keep the file's own, or a rotation for the current file. */
export const orientationPickInput = z.discriminatedUnion("kind", [
  z.strictObject({ kind: z.literal("original"), fileId: z.number().int().positive() }),
  z.strictObject({ kind: z.literal("rotation"), fileId: z.number().int().positive(), quaternion: quaternionInput }),
]);
export type OrientationPickInput = z.infer<typeof orientationPickInput>;

/** POST /api/parts/[partId]/orientation/search: options for the server's run (all optional). */
export const orientationSearchInput = z.strictObject({
  overhangAngle: z.number().min(20, "At least 20°.").max(70, "At most 70°.").optional(),
});
export type OrientationSearchInput = z.infer<typeof orientationSearchInput>;

const vec3 = z.tuple([finite, finite, finite]);

export const cutPlaneInput = z.strictObject({
  normal: vec3.refine((n) => Math.hypot(...n) > 1e-6, "The plane's normal must not be zero."),
  offset: finite,
});

/**
 * POST /api/parts/[partId]/split: the plane chosen (in the print frame of the rotation given), or
 * "to-fit" to let the server cut until every piece fits. The server recomputes every piece.
 */
export const splitAcceptInput = z.strictObject({
  fileId: z.number().int().positive(),
  quaternion: quaternionInput,
  cut: z.discriminatedUnion("kind", [
    z.strictObject({ kind: z.literal("plane"), plane: cutPlaneInput }),
    z.strictObject({ kind: z.literal("to-fit") }),
  ]),
  /** Registration pegs on the cut face (plane cuts into one piece a side), with the clearance the maker sets, mm. */
  pegs: z.strictObject({ clearanceMm: z.coerce.number({ error: "Enter the clearance in mm." }).min(0, "Not below 0 mm.").max(1, "At most 1 mm.") }).optional(),
});
export type SplitAcceptInput = z.infer<typeof splitAcceptInput>;
