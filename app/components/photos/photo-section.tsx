// Build photos on the package page: thumbnails (each opens the photo), whether it goes on
// the spec sheet, and for the builder an upload with a progress bar and a remove button.
import { useState } from "react";
import { useFetcher, useRevalidator } from "react-router";
import type { PhotoUploadAnswer, PhotoView } from "~/lib/photos/photos.server";
import { UploadProgress, uploadWithProgress } from "~/components/dyno/xhr-upload";
import { buttonClass } from "~/components/ui/button";

const MAX_PHOTO_BYTES = 15 * 1024 * 1024;

export function PhotoSection({
  packageId,
  photos,
  canEdit,
}: {
  packageId: number;
  photos: PhotoView[];
  canEdit: boolean;
}) {
  const revalidator = useRevalidator();
  const [progress, setProgress] = useState<number | null>(null);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const body = new FormData(form);
    const file = body.get("file");
    if (!(file instanceof File) || file.size === 0)
      return setMessage({ ok: false, text: "Choose a photo." });
    if (file.size > MAX_PHOTO_BYTES)
      return setMessage({ ok: false, text: "The photo is larger than 15 MB; nothing was stored." });
    setMessage(null);
    setProgress(0);
    try {
      const { status, json } = await uploadWithProgress<PhotoUploadAnswer>(
        `/packages/${packageId}/photos`,
        body,
        setProgress,
      );
      if (json?.ok) {
        form.reset();
        setMessage({ ok: true, text: "Photo stored." });
        await revalidator.revalidate();
      } else
        setMessage({
          ok: false,
          text: json?.message ?? `The server answered ${status}; nothing was stored.`,
        });
    } catch (err) {
      setMessage({ ok: false, text: (err as Error).message });
    } finally {
      setProgress(null);
    }
  }

  return (
    <section
      id="photos"
      aria-labelledby="photos-h"
      className="mt-4 rounded border border-steel-200 bg-white p-3"
    >
      <h2 id="photos-h" className="text-lg font-semibold">
        Build photos
      </h2>
      {photos.length === 0 ? (
        <p className="text-sm text-steel-700">No photos yet.</p>
      ) : (
        <ul className="mt-2 grid grid-cols-2 gap-3 sm:grid-cols-4 lg:grid-cols-6">
          {photos.map((p) => (
            <PhotoCard key={p.id} packageId={packageId} photo={p} canEdit={canEdit} />
          ))}
        </ul>
      )}
      {canEdit ? (
        <form onSubmit={onSubmit} className="mt-3 flex flex-wrap items-end gap-3" noValidate>
          <label className="text-sm">
            <span className="block font-semibold">Photo (JPEG, PNG or WebP, up to 15 MB)</span>
            <input
              type="file"
              name="file"
              accept="image/jpeg,image/png,image/webp"
              className="mt-1 block text-sm"
            />
          </label>
          <label className="text-sm">
            <span className="block font-semibold">Caption</span>
            <input
              name="caption"
              maxLength={200}
              className="mt-1 block rounded border border-steel-300 px-2 py-1"
            />
          </label>
          <button type="submit" className={buttonClass("secondary")} disabled={progress !== null}>
            Upload the photo
          </button>
          <p className="w-full text-xs text-steel-700">
            Photos are re-encoded on upload: camera and location data (EXIF) are not kept.
          </p>
          {progress !== null ? (
            <div className="w-full">
              <UploadProgress fraction={progress} label="Uploading the photo" />
            </div>
          ) : null}
          {message ? (
            <p
              role={message.ok ? "status" : "alert"}
              className={`w-full text-sm ${message.ok ? "text-green-text" : "font-semibold text-red-text"}`}
            >
              {message.text}
            </p>
          ) : null}
        </form>
      ) : null}
    </section>
  );
}

function PhotoCard({
  packageId,
  photo: p,
  canEdit,
}: {
  packageId: number;
  photo: PhotoView;
  canEdit: boolean;
}) {
  const sheet = useFetcher();
  const remove = useFetcher();
  const onSheet = sheet.formData ? sheet.formData.get("onSheet") === "true" : p.onSheet;
  const action = `/packages/${packageId}/photos/${p.id}`;
  if (remove.formData) return null;
  return (
    <li className="text-sm">
      <a href={`/files/${p.fileId}`} target="_blank" rel="noreferrer">
        <img
          src={`/files/${p.thumbFileId}`}
          alt={p.caption || `Build photo ${p.id}`}
          className="aspect-[3/2] w-full rounded border border-steel-200 object-cover"
          loading="lazy"
        />
      </a>
      {p.caption ? <p className="mt-1">{p.caption}</p> : null}
      {canEdit ? (
        <div className="mt-1 flex flex-wrap items-center gap-2">
          <sheet.Form method="post" action={action}>
            <input type="hidden" name="intent" value="on-sheet" />
            <input type="hidden" name="onSheet" value={onSheet ? "false" : "true"} />
            <button type="submit" aria-pressed={onSheet} className="underline">
              {onSheet ? "On the spec sheet ✓" : "Put on the spec sheet"}
            </button>
          </sheet.Form>
          <remove.Form method="post" action={action}>
            <input type="hidden" name="intent" value="remove" />
            <button type="submit" className="text-red-text underline">
              Remove
            </button>
          </remove.Form>
        </div>
      ) : p.onSheet ? (
        <p className="text-steel-700">On the spec sheet</p>
      ) : null}
    </li>
  );
}
