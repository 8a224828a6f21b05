import { LabelsScreen } from '../../features/labels/components/labels-screen';

/** /labels: choose items, kind and stock; preview and print the PDF. */
export function LabelsRoute() {
  return <LabelsScreen />;
}
