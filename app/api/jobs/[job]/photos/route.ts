import { AppError } from "@/lib/errors";
import { route } from "@/lib/route";
import { journalAccess, uploadPhoto } from "@/lib/server/journal";
import { PHOTO_LIMITS } from "@/lib/server/photos";

// Room for the multipart envelope around one photo at the size limit.
const MAX_REQUEST_BYTES = PHOTO_LIMITS.maxBytes + 64 * 1024;

/**
 * POST /api/jobs/:job/photos (multipart/form-data, one file in "photo") — checks, strips and
 * resizes the photo and keeps it for the shop until it is posted in a set.
 */
export const POST = route<never, { job: string }>({
  run: async ({ params, req, actor }) => {
    // Refuse before reading the body: a 50 MB upload never reaches memory.
    await journalAccess(actor, params.job, "journal:post");
    const declared = Number(req.headers.get("content-length") ?? "0");
    if (declared > MAX_REQUEST_BYTES) throw new AppError("too_large", `Photos can be at most ${Math.round(PHOTO_LIMITS.maxBytes / 1024 / 1024)} MB each.`);
    if (!req.headers.get("content-type")?.startsWith("multipart/form-data")) throw new AppError("bad_request", "Send the photo as multipart/form-data.");
    let form: FormData;
    try {
      form = await req.formData();
    } catch {
      throw new AppError("bad_request", "The upload was cut off or is not valid form data; try again.");
    }
    const file = form.get("photo");
    if (!(file instanceof File) || file.size === 0) throw new AppError("invalid", "Attach a photo (form field \"photo\").", { photo: ["Attach a photo."] });
    return { photo: await uploadPhoto(actor, params.job, file) };
  },
});
