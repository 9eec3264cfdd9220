// /api/briefings: drafting, sign-off, the PDFs, verification of an uploaded copy, and the
// development outbox. Another organisation's briefing is a 404; a signed one a 409 to change.
import { Router, type Response } from 'express';
import {
  briefingCreateSchema,
  briefingFileQuerySchema,
  briefingListQuerySchema,
  briefingReturnSchema,
  briefingUpdateSchema,
  briefingVersionCreateSchema,
  outboxAttachmentParamsSchema,
  outboxParamsSchema,
  signOffRequestSchema,
} from '../../shared/api/briefings';
import { idParamsSchema } from '../../shared/api/plans';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { NotFoundError } from '../errors';
import { rateLimited } from '../middleware/rate-limit';
import { actorOf, currentMembership, requireMember } from '../middleware/require-member';
import { singleFileUpload } from '../middleware/upload';
import { briefingDetail, createBriefingService, listBriefings } from '../services/briefings/briefing-workflow';
import { getOutboxMessage, listOutbox, outboxAttachment, outboxEnabled } from '../services/briefings/outbox';
import { verifyUpload } from '../services/briefings/verification';
import { listCaps } from '../../shared/api/pagination';
import { pageOf, sendPage } from '../http/list-page';

/** A PDF for the review page's frame (inline) or as a download; never cached by shared caches. */
function sendPdf(res: Response, pdf: Buffer, filename: string, download: boolean, sha256?: string) {
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Disposition', `${download ? 'attachment' : 'inline'}; filename="${filename.replace(/[^\w.-]/g, '_')}"`);
  res.setHeader('Cache-Control', 'private, no-store');
  if (sha256) res.setHeader('X-Content-SHA256', sha256);
  res.send(pdf);
}

export function briefingsRouter(db: Database, config: Config): Router {
  const router = Router();
  const service = createBriefingService(db, config);
  // Slots of their own: anonymous checks never keep members' uploads waiting.
  const upload = singleFileUpload(Math.min(config.UPLOAD_MAX_MEGABYTES, 32), 'public');

  // Open to anyone, signed in or not: a recipient outside the organisation checks a copy here.
  // Rate-limited per address, before the upload is read, since no account stands behind it.
  const verifyLimiter = rateLimited({
    name: 'verify',
    windowMs: 60_000,
    limit: config.VERIFY_PER_MINUTE,
    message: 'Too many signature checks from this address. Wait a minute and try again.',
  });
  router.post('/verify', verifyLimiter, upload, async (req, res) => {
    const viewerOrganization = req.isAuthenticated() ? (currentMembership(req)?.organizationId ?? null) : null;
    res.json(await verifyUpload(db, config, req.file!.buffer, viewerOrganization));
  });

  router.get('/officials', requireMember('plans:write'), async (req, res) => {
    const page = pageOf(req, listCaps.officials);
    sendPage(res, 'officials', await service.officials(actorOf(req), page), page);
  });

  router.get('/outbox', requireMember('users:manage'), async (req, res) => {
    const enabled = outboxEnabled(config);
    const page = pageOf(req, listCaps.outbox);
    sendPage(res, 'messages', enabled ? await listOutbox(db, actorOf(req).organizationId, page) : [], page, { enabled });
  });
  router.get('/outbox/:messageId', requireMember('users:manage'), async (req, res) => {
    if (!outboxEnabled(config)) throw new NotFoundError('message');
    const { messageId } = outboxParamsSchema.parse(req.params);
    res.json(await getOutboxMessage(db, actorOf(req).organizationId, messageId));
  });
  router.get('/outbox/:messageId/attachments/:index', requireMember('users:manage'), async (req, res) => {
    if (!outboxEnabled(config)) throw new NotFoundError('message');
    const { messageId, index } = outboxAttachmentParamsSchema.parse(req.params);
    const a = await outboxAttachment(db, actorOf(req).organizationId, messageId, index);
    res.setHeader('Content-Type', a.contentType);
    res.setHeader('Content-Disposition', `attachment; filename="${(a.filename ?? `attachment-${index}`).replace(/[^\w.-]/g, '_')}"`);
    res.send(a.content);
  });

  router.get('/', requireMember('plans:read'), async (req, res) => {
    const { planId } = briefingListQuerySchema.parse(req.query);
    const page = pageOf(req, listCaps.briefings);
    sendPage(res, 'briefings', await listBriefings(db, actorOf(req), page, planId), page);
  });
  router.post('/', requireMember('plans:write'), async (req, res) => {
    res.status(201).json(await service.create(actorOf(req), briefingCreateSchema.parse(req.body)));
  });

  router.get('/:id', requireMember('plans:read'), async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await briefingDetail(db, actorOf(req), id));
  });
  router.patch('/:id', requireMember('plans:write'), async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await service.update(actorOf(req), id, briefingUpdateSchema.parse(req.body)));
  });
  router.delete('/:id', requireMember('plans:write'), async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    await service.remove(actorOf(req), id);
    res.status(204).end();
  });

  router.get('/:id/pdf', requireMember('plans:read'), async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    const query = briefingFileQuerySchema.parse(req.query);
    const f = await service.file(actorOf(req), id, query.file);
    sendPdf(res, f.pdf, f.filename, query.download !== undefined, f.sha256);
  });

  router.post('/:id/versions', requireMember('plans:write'), async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.status(201).json(await service.newVersion(actorOf(req), id, briefingVersionCreateSchema.parse(req.body ?? {})));
  });
  router.post('/:id/sign-off-requests', requireMember('plans:write'), async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await service.requestSignOff(actorOf(req), id, signOffRequestSchema.parse(req.body)));
  });
  router.post('/:id/withdraw', requireMember('plans:write'), async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await service.withdraw(actorOf(req), id));
  });
  router.post('/:id/sign', requireMember('briefings:sign'), async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await service.sign(actorOf(req), id));
  });
  router.post('/:id/return', requireMember('briefings:sign'), async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await service.returnWithComment(actorOf(req), id, briefingReturnSchema.parse(req.body).comment));
  });
  router.post('/:id/distribute', requireMember('plans:write'), async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await service.distribute(actorOf(req), id));
  });

  return router;
}
