/** The question the in-app dialog shows, and where its answer goes (one at a time). */
import { Observable } from './observable.ts';
import type { Question } from './session.ts';

export interface PendingQuestion {
  q: Question;
  answer(id: string): void;
}

export const pendingQuestion = new Observable<PendingQuestion | null>(null);

export function askUser(q: Question): Promise<string> {
  return new Promise((resolve) => {
    pendingQuestion.set({
      q,
      answer: (id) => {
        pendingQuestion.set(null);
        resolve(id);
      },
    });
  });
}
