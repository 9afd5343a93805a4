import express, { type Express, type Response } from 'express';
import type { MailboxStore } from './mailbox-store.js';
import {
  renderMailboxPage,
  renderMessagePage,
  renderNotFoundPage,
  type MessageView,
} from './mailbox-pages.js';

const pagePolicy =
  "default-src 'none'; style-src 'unsafe-inline'; frame-src 'self'; base-uri 'none'; form-action 'self'; frame-ancestors 'none'";

// The sandbox directive gives the message an opaque origin with no scripts, forms or popups
// (CSP Level 3 §6.3.2); images may only be the data: URLs mailparser makes of cid: parts.
const messageHtmlPolicy =
  "sandbox; default-src 'none'; img-src data:; style-src 'unsafe-inline'; font-src data:";

function parseId(value: string): number | undefined {
  return /^\d{1,15}$/.test(value) ? Number(value) : undefined;
}

function notFound(response: Response, what: string): void {
  response.status(404).json({ error: 'not_found', message: `${what} was not found` });
}

function sendPage(response: Response, status: number, html: string): void {
  response.status(status).set('Content-Security-Policy', pagePolicy).type('html').send(html);
}

/** The mailbox's web pages and its JSON API over `store`. */
export function createMailboxApp(store: MailboxStore, smtpUrl: () => string): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('etag', false);
  app.use((_request, response, next) => {
    response.set('Cache-Control', 'no-store').set('X-Content-Type-Options', 'nosniff');
    next();
  });

  app.get('/api/messages', (_request, response) => {
    response.json(store.messages());
  });
  app.delete('/api/messages', (_request, response) => {
    store.clear();
    response.status(204).end();
  });
  app.get('/api/messages/:id', (request, response) => {
    const message = store.message(parseId(request.params.id) ?? -1);
    if (!message) {
      notFound(response, `Message ${request.params.id}`);
      return;
    }
    response.json(message);
  });
  app.get('/api/messages/:id/attachments/:index', (request, response) => {
    const id = parseId(request.params.id) ?? -1;
    const index = parseId(request.params.index) ?? -1;
    const message = store.message(id);
    const content = store.attachment(id, index);
    const attachment = message?.attachments[index];
    if (!attachment || !content) {
      notFound(response, `Attachment ${request.params.index} of message ${request.params.id}`);
      return;
    }
    response
      .type(attachment.contentType)
      .attachment(attachment.filename)
      .set('Content-Security-Policy', 'sandbox')
      .send(content);
  });
  app.use('/api', (_request, response) => {
    notFound(response, 'This API route');
  });

  app.get('/', (_request, response) => {
    sendPage(response, 200, renderMailboxPage(store.messages(), smtpUrl()));
  });
  app.post('/clear', (_request, response) => {
    store.clear();
    response.redirect(303, '/');
  });
  app.get('/messages/:id', (request, response) => {
    const message = store.message(parseId(request.params.id) ?? -1);
    if (!message) {
      sendPage(response, 404, renderNotFoundPage(smtpUrl()));
      return;
    }
    const asked = String(request.query['view'] ?? '');
    const view: MessageView = ['html', 'text', 'attachments'].includes(asked)
      ? (asked as MessageView)
      : message.html !== null
        ? 'html'
        : 'text';
    sendPage(response, 200, renderMessagePage(message, view, smtpUrl()));
  });
  app.get('/messages/:id/html', (request, response) => {
    const message = store.message(parseId(request.params.id) ?? -1);
    if (!message || message.html === null) {
      sendPage(response, 404, renderNotFoundPage(smtpUrl()));
      return;
    }
    response
      .set('Content-Security-Policy', messageHtmlPolicy)
      .set('Referrer-Policy', 'no-referrer')
      .type('html')
      .send(message.html);
  });
  app.use((_request, response) => {
    sendPage(response, 404, renderNotFoundPage(smtpUrl()));
  });
  return app;
}
