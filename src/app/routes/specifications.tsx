import { SpecificationsScreen } from '../../features/specifications/components/specifications-screen';

/** /specifications: the limits table with sources; managers add rows. */
export function SpecificationsRoute() {
  return <SpecificationsScreen />;
}
