import { CheckInRoute } from '../../features/check-in/routes/check-in';
import { PhotoUpload } from '../../features/photos/components/photo-upload';

/** Check-in, with a photo of a reported defect (a worn tyre, a cracked lever) taken at the counter. */
export function CheckInWithPhotos() {
  return (
    <CheckInRoute
      defectExtra={(bikeId, defectId) => (
        <section aria-label="Photo of the defect" className="flex flex-col gap-2 rounded-card border-2 border-ink-line bg-paper-raised p-4">
          <h2 className="text-xl font-bold">Add a photo of the defect</h2>
          <p className="text-ink-soft">It helps the workshop see what you saw.</p>
          <PhotoUpload bikeId={bikeId} defectId={defectId} />
        </section>
      )}
    />
  );
}
