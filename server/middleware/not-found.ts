import type { RequestHandler } from 'express';
import type { ErrorEnvelope } from '../../shared/api/errors';

export const apiNotFound: RequestHandler = (req, res) => {
  const body: ErrorEnvelope = { error: { code: 'not_found', message: `No API route ${req.method} ${req.path}.` } };
  res.status(404).json(body);
};
