/** The catalogue of hostile inputs through BREAKS, SEGMENTS, SUMMARY and knotwise breaks, for every changepoint model. */
import { MODELS } from './catalogue';
import { catalogueSuite } from './catalogueSuite';

catalogueSuite('changepoints', MODELS);
