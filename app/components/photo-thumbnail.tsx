/** A stored photo's thumbnail, linked to the full image. */
export function PhotoThumbnail({ photoId, replicate, label }: { photoId: number; replicate: number; label: string }) {
  return (
    <a href={`/files/${photoId}`} target="_blank" rel="noreferrer" className="inline-block w-fit rounded focus-visible:outline-2">
      <img src={`/files/${photoId}?thumbnail`} alt={`${label} of replicate ${replicate} (opens the full image)`} className="h-16 w-24 rounded border border-basalt-200 object-cover" />
    </a>
  );
}
