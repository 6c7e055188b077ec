import { BikePageRoute } from '../../features/fleet/routes/bike-page';
import { ValveTrendsPanel } from '../../features/valves/components/valve-trends-panel';
import { PhotoGallery } from '../../features/photos/components/photo-gallery';
import { PhotoUpload } from '../../features/photos/components/photo-upload';
import { useMe } from '../../lib/use-me';

/** The bike's page with what other features add to its story; features never import each other. */
export function BikeRoute() {
  const me = useMe();
  return (
    <BikePageRoute
      links={[{ to: (id) => `/fleet/${id}/record`, label: 'Printable service record' }]}
      panels={[
        { key: 'valves', title: 'Valve clearances', render: (id) => <ValveTrendsPanel bikeId={id} /> },
        {
          key: 'photos',
          title: 'Photos and documents',
          render: (id) => (
            <div className="flex flex-col gap-3">
              <h2 className="text-xl font-bold">Photos and documents</h2>
              {me.role !== 'admin' && <PhotoUpload bikeId={id} />}
              <PhotoGallery bikeId={id} />
            </div>
          ),
        },
      ]}
    />
  );
}
