import { z } from "zod";

const fileId = z.coerce.number({ error: "Which mesh version?" }).int().positive("Which mesh version?");

/** Repair the part's current mesh (the version the member saw). */
export const meshRepairInput = z.strictObject({ fileId });
export type MeshRepairInput = z.infer<typeof meshRepairInput>;

/** An operator accepts a mesh that is not a closed solid, saying why. */
export const meshAcceptInput = z.strictObject({
  fileId,
  note: z.string().trim().min(3, "Say why the workshop accepts this mesh as it is.").max(500, "At most 500 characters."),
});
export type MeshAcceptInput = z.infer<typeof meshAcceptInput>;
