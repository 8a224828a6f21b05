import type { LabelPrintKind } from '../../../../shared/schemas/labels';
import { ButtonLink, type ButtonSize, type ButtonVariant } from '../../../components/ui/button';
import { paths } from '../../../config/paths';
import { useCan } from '../../auth/api/queries';

/**
 * "Print labels" for other screens (a selection of specimens, a cut list, a container, a half
 * after a test): opens the labels page with the kind and codes filled in. Hidden from roles that
 * print no labels, and when there is nothing to print.
 */
export function PrintLabelsLink({
  kind,
  codes,
  label = 'Print labels',
  variant = 'secondary',
  size = 'md',
}: {
  kind: LabelPrintKind;
  codes: readonly string[];
  label?: string;
  variant?: ButtonVariant;
  size?: ButtonSize;
}) {
  const canPrint = useCan('labels.print');
  if (!canPrint || codes.length === 0) return null;
  return (
    <ButtonLink to={paths.labels.href(kind, codes)} variant={variant} size={size} data-testid="print-labels-link">
      <span aria-hidden>⎙</span> {label}
    </ButtonLink>
  );
}
