import type { StudyView } from '../../shared-core/api.js';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import { readSiteSettings, writeSiteSettings } from '../services/site-settings.js';
import type { HostServices } from './host-handlers.js';
import { HostError } from './host-error.js';

/**
 * The real services behind the channels (src-main/services and the core). Both hosts use this one
 * wiring; tests substitute fakes through the HostServices interface.
 */
export function nodeHostServices(folders: { siteSettings: string }): HostServices {
  const unavailable = (what: string): never => {
    throw new HostError('unavailable', `${what} is not part of this build yet`);
  };
  return {
    async demoStudy(): Promise<StudyView> {
      return unavailable('the demo study');
    },
    async openStudy() {
      return unavailable('opening a study');
    },
    async saveStudy() {
      return unavailable('saving a study');
    },
    async inspectData() {
      return unavailable('inspecting a data file');
    },
    analyze: (observations, exclusions, options) => analyzePhaseOne(observations, exclusions, options),
    readSettings: () => readSiteSettings(folders.siteSettings),
    writeSettings: (settings) => writeSiteSettings(folders.siteSettings, settings),
  };
}
