import type { EntityManager } from '@mikro-orm/postgresql';
import { z } from 'zod';
import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { notFound } from '../../http/errors';
import type { Config } from '../../config';
import { createFeed, feedStatus, renderFeed, revokeFeed } from './calendar-feed.service';

/** The token as it appears in the URL, with or without the .ics ending calendar apps like. */
const tokenParam = z.object({
  token: z
    .string()
    .regex(/^[A-Za-z0-9_-]{20,100}(\.ics)?$/, 'Unknown calendar')
    .transform((t) => t.replace(/\.ics$/, '')),
});

export function registerCalendarFeedRoutes(r: ApiRouter, config: Config) {
  const em = () => requestEm() as EntityManager;
  route(r, 'get', '/calendar-feed', { access: 'signed-in' }, async (_req, res, { principal: who }) => {
    res.json(await feedStatus(em(), who));
  });
  route(r, 'post', '/calendar-feed', { access: 'signed-in' }, async (_req, res, { principal: who }) => {
    res.status(201).json(await createFeed(em(), who, config.APP_URL));
  });
  route(r, 'delete', '/calendar-feed', { access: 'signed-in' }, async (_req, res, { principal: who }) => {
    res.json(await revokeFeed(em(), who));
  });
  // Calendar apps fetch this without a session: the unguessable token is the credential.
  route(r, 'get', '/calendar/:token', { access: 'public' }, async (req, res) => {
    const parsed = tokenParam.safeParse(req.params);
    if (!parsed.success) throw notFound('Calendar');
    const text = await renderFeed(em(), parsed.data.token, config.APP_URL);
    if (text === null) throw notFound('Calendar');
    res.setHeader('Content-Type', 'text/calendar; charset=utf-8');
    res.setHeader('Cache-Control', 'private, max-age=300');
    res.send(text);
  });
}
