import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ReportIssued } from '../../../../shared/schemas/reports';
import type { SignatureResponse } from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';

/** Signs with the password (meaning "report") and issues the order's report with that signature. */
export function useIssueReport(orderId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: async ({ password, reason }: { password: string; reason?: string }) => {
      const signature = await api<SignatureResponse>('/auth/signature', { method: 'POST', json: { password, meaning: 'report' } });
      return api<ReportIssued>('/reports', { method: 'POST', json: { orderId, signatureToken: signature.signatureToken, ...(reason ? { reason } : {}) } });
    },
    onSuccess: () => client.invalidateQueries({ queryKey: ['results'] }),
  });
}
