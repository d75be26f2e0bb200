// Listings, the market's presets for sale: the lifecycle commands of sellers and admins
// (lifecycle.ts, whose allowed state changes are states.ts's one table) and the read models
// of the seller, the admin and the public page (views.ts).
export { createListing, decideListing, submitListing, unlistListing, updateListing } from './lifecycle';
export { cardOf, cardPictureUrl, getListingDetail, listListingsForAdmin, listOwnListings, pictureUrl, type ListingRow } from './views';
export { createListingVersion, decideListingVersion, listListingVersions, listVersionsForAdmin } from './versions';
