import type request from 'supertest';

/** A signed-in client or a bearer one: anything that gets and posts. */
interface Client {
  get(path: string): request.Test;
  post(path: string, body?: object): request.Test;
}

/**
 * Publishes a draft as the editor does: reads its impact, then publishes with the impact's
 * token under a name of its own. Answers the publish response.
 */
export async function publishSeen(coordinator: Client, draftId: number, name: string) {
  const impact = await coordinator.get(`/api/ladder/versions/${draftId}/impact`);
  return coordinator.post(`/api/ladder/versions/${draftId}/publish`, {
    impactToken: impact.body.token,
    name,
  });
}
