export { LoadingScreen as default } from '@/components/ui/LoadingScreen';
