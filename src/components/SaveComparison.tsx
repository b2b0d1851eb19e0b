import { useId, useState } from 'react';
import { errorMessage, sendJson } from '../lib/client/api.ts';
import type { SelectionView } from '../lib/shared/selection.ts';
import type { WatchView } from '../lib/shared/watch.ts';
import { buttonQuiet, input, muted, panel } from './ui.tsx';

type State = { busy?: boolean; error?: string; done?: { text: string; href: string } };

/**
 * Keeps the comparison on this page (its address: filters, common criterion, scale): as a watch
 * that mails when its records change, or frozen as a citable selection.
 */
export default function SaveComparison({ signedIn }: { signedIn: boolean }) {
  const id = useId();
  const [title, setTitle] = useState('');
  const [state, setState] = useState<State>({});
  if (!signedIn)
    return (
      <p className={`text-sm ${muted}`}>
        <a href="/signin?next=/windows" className="underline">
          Sign in
        </a>{' '}
        to watch this comparison or freeze it as a citable selection.
      </p>
    );
  const query = () => location.search.replace(/^\?/, '');
  const act = async (kind: 'watch' | 'selection') => {
    if (!title.trim()) {
      setState({ error: 'Give it a name first.' });
      return;
    }
    setState({ busy: true });
    try {
      if (kind === 'watch') {
        await sendJson<WatchView>('/api/v1/watches', { name: title.trim(), query: query() });
        setState({
          done: {
            text: 'Watching. At most one e-mail a day; see your watches',
            href: '/account#watches-h',
          },
        });
      } else {
        const s = await sendJson<SelectionView>('/api/v1/selections', {
          title: title.trim(),
          query: query(),
        });
        setState({
          done: {
            text: `Frozen as ${s.handle} (${s.items.length} records)`,
            href: `/selections/${s.handle}`,
          },
        });
      }
    } catch (err) {
      setState({ error: errorMessage(err) });
    }
  };
  return (
    <div className={`${panel} p-4 grid gap-3`}>
      <div className="grid gap-1">
        <label htmlFor={id} className="text-sm font-semibold">
          Keep this comparison
        </label>
        <input
          id={id}
          value={title}
          maxLength={200}
          placeholder="A name, e.g. Aqueous windows on carbon at S ≤ 0.1"
          onChange={(e) => setTitle(e.target.value)}
          className={input}
        />
      </div>
      <div className="flex flex-wrap gap-2">
        <button
          type="button"
          className={buttonQuiet}
          disabled={state.busy}
          onClick={() => void act('watch')}
        >
          Watch for changes
        </button>
        <button
          type="button"
          className={buttonQuiet}
          disabled={state.busy}
          onClick={() => void act('selection')}
        >
          Freeze as a citable selection
        </button>
      </div>
      <p className={`text-sm ${muted}`}>
        A selection keeps the public records’ current versions and numbers under a handle of its
        own; later versions never change it.
      </p>
      <div aria-live="polite" className="text-sm">
        {state.error && <p role="alert">{state.error}</p>}
        {state.done && (
          <p>
            <a
              href={state.done.href}
              className="underline text-cobalt dark:text-night-cobalt"
              data-testid="saved-link"
            >
              {state.done.text}
            </a>
          </p>
        )}
      </div>
    </div>
  );
}
