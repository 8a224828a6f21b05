import { ScanScreen } from '../../features/scan/components/scan-screen';

/** /scan: the scanner for every hand-off, phone first. */
export function ScanRoute() {
  return <ScanScreen />;
}
