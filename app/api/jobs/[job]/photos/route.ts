import { z } from "zod";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { uploadPhoto } from "@/lib/server/journal";
import { receivePhotoFile } from "@/lib/server/photos";

/**
 * POST /api/jobs/:job/photos (multipart/form-data, one file in "photo") — checks, strips and
 * resizes the photo and keeps it for the shop until it is posted in a set. Access is checked
 * before the body is read; the photo streams to a temporary file with its size limit enforced
 * as it arrives (413, nothing more read), so an over-size or unannounced body never fills memory.
 */
export const POST = route({ params: z.object({ job: ids.job }), body: "multipart", resource: "job", permission: "journal:post" }, async ({ req, found, actor }) => {
  const upload = await receivePhotoFile(req);
  try {
    return { photo: await uploadPhoto(actor, found, upload.file) };
  } finally {
    await upload.dispose();
  }
});
