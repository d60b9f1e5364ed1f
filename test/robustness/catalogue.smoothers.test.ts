/** The catalogue of hostile inputs through SMOOTH, PENALTY, KNOTS, EVALUATE, SUMMARY and knotwise fit, for every smoothing method. */
import { SMOOTHERS } from './catalogue';
import { catalogueSuite } from './catalogueSuite';

catalogueSuite('smoothers', SMOOTHERS);
