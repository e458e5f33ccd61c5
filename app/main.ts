import './ui/seedfall-app';
