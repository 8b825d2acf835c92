import { api, ApiError, hostKind } from '../transport/index.js';
import { defaultSiteSettings, type SiteSettings } from '../../shared-core/settings/site-settings.js';
import { study } from './study.svelte.js';
import { review } from './review.svelte.js';
import { studyFile } from './study-file.svelte.js';

/** How the app reached its host and what it opened first. */
class Session {
  status = $state<'starting' | 'ready' | 'failed'>('starting');
  message = $state('');
  host = hostKind;
  settings = $state.raw<SiteSettings>(defaultSiteSettings);

  /** First start: the invented demo study, so there is something to review straight away. */
  async start(): Promise<void> {
    this.status = 'starting';
    try {
      const settings = await api.siteSettings({}).catch(() => defaultSiteSettings);
      this.settings = settings;
      review.causeCategories = [...settings.causeCategories];
      const demo = await api.demoStudy({});
      study.loadView(demo, true);
      studyFile.opened(null);
      this.status = 'ready';
    } catch (error) {
      this.status = 'failed';
      this.message = error instanceof ApiError || error instanceof Error ? error.message : String(error);
    }
  }
}

export const session = new Session();
