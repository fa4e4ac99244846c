import { afterEach, describe, expect, it, vi } from 'vitest';
import type { UploadListItem, UploadListResponse } from '../../../../shared/api/uploads.js';
import NotebookEarlierUploads from '@/components/notebook/NotebookEarlierUploads.vue';
import { buttonNamed, click, fakeServer, mountCollab } from '../collab/support';

function item(i: number): UploadListItem {
  return {
    id: `up-${i}`,
    fileName: `ride-${i}.fit`,
    size: 40_000 + i,
    format: 'fit',
    device: i % 2 === 0 ? { name: `Spider PM · serial ${i}`, manufacturer: null, product: 'Spider PM', serialNumber: i } : null,
    startedAt: '2026-03-02T09:00:00.000Z',
    uploadedAt: '2026-03-03T10:00:00.000Z',
    uploadedBy: { id: 'u1', name: 'Sam' },
  };
}

afterEach(() => {
  vi.unstubAllGlobals();
  document.body.innerHTML = '';
});

describe('NotebookEarlierUploads', () => {
  it('lists the workspace’s earlier uploads with device and uploader only once opened, and hands back the chosen one', async () => {
    const seen = fakeServer({
      'GET /api/uploads': (_b, path): { body: UploadListResponse } => {
        const offset = Number(new URL(path, 'http://x').searchParams.get('offset'));
        return { body: { uploads: [item(offset + 1), item(offset + 2)], total: 12, offset, limit: 8 } };
      },
    });
    const { wrapper } = await mountCollab(NotebookEarlierUploads, { props: { workspaceId: 'w1', slotLabel: 'Crank under test', currentId: 'up-1' } });
    expect(seen).toHaveLength(0);

    await click(buttonNamed(/Choose an earlier upload/));
    expect(seen[0]!.path).toContain('workspace=w1');
    const text = document.body.textContent ?? '';
    expect(text).toContain('Earlier uploads for Crank under test');
    expect(text).toContain('ride-2.fit');
    expect(text).toContain('Spider PM · serial 2');
    expect(text).toContain('not stated');
    expect(text).toContain('by Sam');
    // The file the slot reads now is marked, not offered again.
    expect(text).toContain('in use');

    await click(document.body.querySelector('button[aria-label="Use ride-2.fit for Crank under test"]')!);
    expect(wrapper.emitted('choose')?.[0]?.[0]).toMatchObject({ id: 'up-2', fileName: 'ride-2.fit' });
  });
});
