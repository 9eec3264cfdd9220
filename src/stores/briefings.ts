// Briefings: the list (all, or one plan's), the briefing open for review with the mail report of
// its last step, and every step of the workflow (draft, edit, ask for sign-off, withdraw, sign,
// return, new version, resend, delete), verification of a PDF, and the development outbox.
// Each step answers with the briefing as it now is; the store keeps that as the open briefing.
import { defineStore } from 'pinia';
import { ref, shallowRef } from 'vue';
import type {
  BriefingCreate,
  BriefingDetail,
  BriefingStepResponse,
  BriefingSummary,
  BriefingUpdate,
  MailReport,
  SignOffRequest,
} from '@shared/api/briefings';
import * as briefingsApi from '@/api/briefings';

export const useBriefingsStore = defineStore('briefings', () => {
  const briefings = ref<BriefingSummary[]>([]);
  const listLoading = ref(false);
  const listError = ref('');
  const shown = shallowRef<BriefingDetail | null>(null);
  const mail = shallowRef<MailReport | null>(null);
  let listSerial = 0;

  /** The briefings of one plan, or of all plans (no plan). */
  async function loadList(planId?: string) {
    const serial = ++listSerial;
    listLoading.value = true;
    listError.value = '';
    try {
      const list = await briefingsApi.listBriefings(planId);
      if (serial === listSerial) briefings.value = list;
    } catch (e) {
      if (serial === listSerial) listError.value = e instanceof Error ? e.message : String(e);
    } finally {
      if (serial === listSerial) listLoading.value = false;
    }
  }

  /** Opens a briefing for review; null (and the error thrown) when it cannot be read. */
  async function open(id: string) {
    mail.value = null;
    // Another briefing's page never shows while this one loads.
    if (shown.value?.id !== id) shown.value = null;
    try {
      shown.value = await briefingsApi.getBriefing(id);
    } catch (e) {
      shown.value = null;
      throw e;
    }
  }

  /** A step's answer: the briefing as it now is, and what the mail did. */
  function applyStep(step: BriefingStepResponse) {
    if (shown.value === null || shown.value.id === step.briefing.id) {
      shown.value = step.briefing;
      mail.value = step.mail;
    }
    return step;
  }

  const stepOf = async (work: Promise<BriefingStepResponse>) => applyStep(await work);

  return {
    briefings,
    listLoading,
    listError,
    shown,
    mail,
    loadList,
    open,
    applyStep,
    create: (input: BriefingCreate) => briefingsApi.createBriefing(input),
    update: (id: string, input: BriefingUpdate) => stepOf(briefingsApi.updateBriefing(id, input)),
    remove: (id: string) => briefingsApi.deleteBriefing(id),
    newVersion: (id: string) => briefingsApi.createBriefingVersion(id),
    officials: () => briefingsApi.listOfficials(),
    requestSignOff: (id: string, input: SignOffRequest) => stepOf(briefingsApi.requestSignOff(id, input)),
    withdrawSignOffRequest: (id: string) => stepOf(briefingsApi.withdrawSignOffRequest(id)),
    sign: (id: string) => stepOf(briefingsApi.signBriefing(id)),
    sendBack: (id: string, comment: string) => stepOf(briefingsApi.returnBriefing(id, comment)),
    distribute: (id: string) => stepOf(briefingsApi.distributeBriefing(id)),
    verify: (file: File) => briefingsApi.verifyBriefingFile(file),
    pdfUrl: briefingsApi.briefingPdfUrl,
    outbox: () => briefingsApi.listOutbox(),
    outboxMessage: (id: number) => briefingsApi.getOutboxMessage(id),
    outboxAttachmentUrl: briefingsApi.outboxAttachmentUrl,
  };
});
